/**
 * The camera raw formats accepted, by name only: no I/O here, so forms, schemas and the upload
 * panel may import it. Decoding lives in lib/image/raw.ts.
 */

/** The raw formats accepted, by the extension cameras give them. */
export const RAW_KINDS = ['dng', 'cr2', 'cr3', 'nef', 'arw', 'raf', 'orf', 'rw2', 'pef', 'srw'] as const;
export type RawKind = (typeof RAW_KINDS)[number];

/** Extension, media type and name of each accepted raw format. */
export const RAW_TYPES: Record<RawKind, { ext: string; contentType: string; label: string }> = {
  dng: { ext: 'dng', contentType: 'image/x-adobe-dng', label: 'DNG' },
  cr2: { ext: 'cr2', contentType: 'image/x-canon-cr2', label: 'Canon CR2' },
  cr3: { ext: 'cr3', contentType: 'image/x-canon-cr3', label: 'Canon CR3' },
  nef: { ext: 'nef', contentType: 'image/x-nikon-nef', label: 'Nikon NEF' },
  arw: { ext: 'arw', contentType: 'image/x-sony-arw', label: 'Sony ARW' },
  raf: { ext: 'raf', contentType: 'image/x-fuji-raf', label: 'Fujifilm RAF' },
  orf: { ext: 'orf', contentType: 'image/x-olympus-orf', label: 'Olympus ORF' },
  rw2: { ext: 'rw2', contentType: 'image/x-panasonic-rw2', label: 'Panasonic RW2' },
  pef: { ext: 'pef', contentType: 'image/x-pentax-pef', label: 'Pentax PEF' },
  srw: { ext: 'srw', contentType: 'image/x-samsung-srw', label: 'Samsung SRW' },
};

/** The accepted formats as a phrase for messages and help texts. */
export const RAW_LIST = 'DNG, CR2, CR3, NEF, ARW, RAF, ORF, RW2, PEF, SRW';

/** Media type → extensions of the raw formats, for a file picker's accept list. */
export const RAW_ACCEPT: Record<string, string[]> = Object.fromEntries(RAW_KINDS.map((k) => [RAW_TYPES[k].contentType, [`.${RAW_TYPES[k].ext}`]]));

/** True for a stored photo's format that is a camera raw. */
export function isRawFormat(format: string): format is RawKind {
  return (RAW_KINDS as readonly string[]).includes(format);
}

/** Every photo the upload takes, for react-dropzone's accept: any image type, and raw files by extension (browsers often give them no type). */
export const PHOTO_ACCEPT: Record<string, string[]> = { 'image/*': [], ...RAW_ACCEPT };

/** The same as an `accept` attribute of a file input. */
export const PHOTO_ACCEPT_ATTRIBUTE = ['image/*', ...RAW_KINDS.map((k) => `.${RAW_TYPES[k].ext}`)].join(',');
