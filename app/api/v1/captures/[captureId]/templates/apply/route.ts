export { POST } from '../../../../../captures/[captureId]/templates/apply/route';
