export { POST } from '../../../../captures/[captureId]/photos/route';
