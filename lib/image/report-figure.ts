import sharp from 'sharp';
import { MAX_PIXELS } from './decode';

/** The longest side of a figure in a report, px: about 190 dpi across the printed half-page width. */
export const REPORT_FIGURE_SIDE = 640;

/** Palette sizes: a photo keeps its tones with 48 colours; a false-colour map reads well in 16 steps of its ramp (its caption gives the scale). */
export const REPORT_PALETTE = { photo: 48, map: 16 } as const;

export type ReportFigure = { png: Buffer; width: number; height: number };

/**
 * A picture for a PDF report (a capture photo or one of the engine's false-colour maps), scaled to at
 * most REPORT_FIGURE_SIDE a side, EXIF orientation applied, and quantised to a small palette PNG
 * (sharp's libimagequant, without dithering, which would only add noise that deflate cannot pack),
 * so a report with a dozen pictures stays a few hundred kilobytes. pdfkit embeds the palette PNG
 * as an indexed image as it is.
 */
export async function reportFigure(bytes: Uint8Array, kind: 'photo' | 'map', maxSide = REPORT_FIGURE_SIDE): Promise<ReportFigure> {
  const { data, info } = await sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: 'truncated' })
    .rotate()
    .resize({ width: maxSide, height: maxSide, fit: 'inside', withoutEnlargement: true })
    .removeAlpha()
    .toColourspace('srgb')
    .png({ palette: true, colours: REPORT_PALETTE[kind], dither: 0, compressionLevel: 9, effort: 10 })
    .toBuffer({ resolveWithObject: true });
  return { png: data, width: info.width, height: info.height };
}
