export { GET, PUT } from '../../../../captures/[captureId]/regions/route';
