export { GET, POST } from '../../../../captures/[captureId]/analyses/route';
