import { EngineInputError } from '../photometry/errors';

const RAW_EXTENSIONS = new Set(['cr2', 'cr3', 'crw', 'nef', 'nrw', 'arw', 'srf', 'sr2', 'dng', 'orf', 'rw2', 'raf', 'pef', 'srw', 'x3f', 'erf', 'kdc', 'mrw', '3fr', 'iiq', 'rwl']);
const SEND_INSTEAD = 'export the photo as 16-bit TIFF or JPEG';

function ascii(buf: Uint8Array, start: number, length: number): string {
  return String.fromCharCode(...buf.subarray(start, start + length));
}

// DNG and most raw formats are TIFF containers: a DNGVersion tag (0xC612) in IFD0 gives them away
function tiffHasDngTag(buf: Uint8Array): boolean {
  if (buf.length < 16) return false;
  const little = buf[0] === 0x49;
  const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  const u16 = (o: number): number => view.getUint16(o, little);
  const u32 = (o: number): number => view.getUint32(o, little);
  const ifd = u32(4);
  if (ifd + 2 > buf.length) return false;
  const n = u16(ifd);
  for (let k = 0; k < n; k++) {
    const e = ifd + 2 + 12 * k;
    if (e + 2 > buf.length) return false;
    if (u16(e) === 0xc612) return true;
  }
  return false;
}

/**
 * Refuses formats the engine cannot measure from, by content and file name, with what to send
 * instead. Returns normally for anything sharp should try.
 */
export function refuseUnsupported(buf: Uint8Array, name = ''): void {
  const ext = name.toLowerCase().split('.').pop() ?? '';
  if (buf.length >= 12 && ascii(buf, 4, 4) === 'ftyp') {
    const brand = ascii(buf, 8, 4);
    if (brand === 'crx ') throw new EngineInputError('unsupported-format', `camera raw (CR3) is not supported: ${SEND_INSTEAD}`);
    if (brand.startsWith('avi')) throw new EngineInputError('unsupported-format', `AVIF is not supported: ${SEND_INSTEAD}`);
    if (['heic', 'heix', 'hevc', 'hevx', 'heim', 'heis', 'mif1', 'msf1'].includes(brand)) {
      throw new EngineInputError('unsupported-format', `HEIC is not supported: ${SEND_INSTEAD}`);
    }
  }
  if (buf.length >= 8 && ascii(buf, 0, 8) === 'FUJIFILM') throw new EngineInputError('unsupported-format', `camera raw (RAF) is not supported: ${SEND_INSTEAD}`);
  const tiff = buf.length >= 8 && ((buf[0] === 0x49 && buf[1] === 0x49) || (buf[0] === 0x4d && buf[1] === 0x4d));
  if (tiff) {
    const magic = ascii(buf, 2, 2);
    if (magic === 'RO' || magic === 'RS' || magic === 'U\0') throw new EngineInputError('unsupported-format', `camera raw is not supported: ${SEND_INSTEAD}`);
    if (ascii(buf, 8, 2) === 'CR') throw new EngineInputError('unsupported-format', `camera raw (CR2) is not supported: ${SEND_INSTEAD}`);
    if (tiffHasDngTag(buf)) throw new EngineInputError('unsupported-format', `camera raw (DNG) is not supported: ${SEND_INSTEAD}`);
  }
  if (RAW_EXTENSIONS.has(ext)) throw new EngineInputError('unsupported-format', `camera raw (.${ext}) is not supported: ${SEND_INSTEAD}`);
  if (ext === 'heic' || ext === 'heif') throw new EngineInputError('unsupported-format', `HEIC is not supported: ${SEND_INSTEAD}`);
  if (ext === 'avif') throw new EngineInputError('unsupported-format', `AVIF is not supported: ${SEND_INSTEAD}`);
}
