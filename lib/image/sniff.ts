import { EngineInputError } from '../photometry/errors';
import { isOtherRawTiff, RAW_KINDS, RAW_LIST, RAW_TYPES, sniffRaw, type RawKind } from './raw';

// raw formats of other makers and older cameras: not decoded, the tester converts them to DNG
const OTHER_RAW_EXTENSIONS = new Set(['crw', 'nrw', 'srf', 'sr2', 'x3f', 'erf', 'kdc', 'mrw', '3fr', 'iiq', 'rwl', 'mef', 'mos', 'dcr']);
const SEND_INSTEAD = 'export the photo as 16-bit TIFF or JPEG';
const CONVERT = `convert it to DNG (or export a 16-bit TIFF); the raw formats read directly are ${RAW_LIST}`;

function ascii(buf: Uint8Array, start: number, length: number): string {
  return String.fromCharCode(...buf.subarray(start, start + length));
}

/**
 * Refuses formats the engine cannot measure from, by content and file name, with what to send
 * instead. Returns normally for anything sharp should try, and for the camera raw formats the
 * libraw tools decode (lib/image/raw.ts).
 */
export function refuseUnsupported(buf: Uint8Array, name = ''): void {
  const ext = name.toLowerCase().split('.').pop() ?? '';
  if (sniffRaw(buf, name)) return;
  if (buf.length >= 12 && ascii(buf, 4, 4) === 'ftyp') {
    const brand = ascii(buf, 8, 4);
    if (brand.startsWith('avi')) throw new EngineInputError('unsupported-format', `AVIF is not supported: ${SEND_INSTEAD}`);
    if (['heic', 'heix', 'hevc', 'hevx', 'heim', 'heis', 'mif1', 'msf1'].includes(brand)) {
      throw new EngineInputError('unsupported-format', `HEIC is not supported: ${SEND_INSTEAD}`);
    }
  }
  if (isOtherRawTiff(buf)) throw new EngineInputError('unsupported-format', `${name || 'the photo'} is a camera raw file of a format not read here: ${CONVERT}`);
  if ((RAW_KINDS as readonly string[]).includes(ext)) {
    throw new EngineInputError('not-an-image', `${name} is named .${ext} but its content is not a ${RAW_TYPES[ext as RawKind].label} raw file: upload the original file from the camera`);
  }
  if (OTHER_RAW_EXTENSIONS.has(ext)) throw new EngineInputError('unsupported-format', `camera raw (.${ext}) is not read here: ${CONVERT}`);
  if (ext === 'heic' || ext === 'heif') throw new EngineInputError('unsupported-format', `HEIC is not supported: ${SEND_INSTEAD}`);
  if (ext === 'avif') throw new EngineInputError('unsupported-format', `AVIF is not supported: ${SEND_INSTEAD}`);
}
