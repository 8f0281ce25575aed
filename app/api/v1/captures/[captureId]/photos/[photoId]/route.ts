export { PATCH } from '../../../../../captures/[captureId]/photos/[photoId]/route';
