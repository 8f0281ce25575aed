export { GET } from '../../../../captures/[captureId]/templates/route';
