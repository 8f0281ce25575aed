import { applyPaletteSync, buildPaletteSync, utils } from 'image-q';
import sharp from 'sharp';
import { MAX_PIXELS } from './decode';

/** The longest side of a figure in a report, px: about 190 dpi across the printed half-page width. */
export const REPORT_FIGURE_SIDE = 640;

/** Palette sizes: a photo keeps its tones with 48 colours; a false-colour map reads well in 16 steps of its ramp (its caption gives the scale). */
export const REPORT_PALETTE = { photo: 48, map: 16 } as const;

export type ReportFigure = { png: Buffer; width: number; height: number; colours: number };

/**
 * A picture for a PDF report (a capture photo or one of the engine's false-colour maps), scaled to at
 * most REPORT_FIGURE_SIDE a side with EXIF orientation applied, then quantised to a small palette
 * with image-q (Wu's colour quantiser, distances weighted as the eye weighs R, G and B (BT.709), no
 * dithering, which would only add noise that deflate cannot pack) and written as a palette PNG, so
 * a report with a dozen pictures stays a few hundred kilobytes. pdfkit embeds the palette PNG as an
 * indexed image as it is.
 */
export async function reportFigure(bytes: Uint8Array, kind: 'photo' | 'map', maxSide = REPORT_FIGURE_SIDE): Promise<ReportFigure> {
  const { data, info } = await sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: 'truncated' })
    .rotate()
    .resize({ width: maxSide, height: maxSide, fit: 'inside', withoutEnlargement: true })
    .toColourspace('srgb')
    .removeAlpha()
    .ensureAlpha()
    .raw()
    .toBuffer({ resolveWithObject: true });
  const { width, height } = info;
  const points = utils.PointContainer.fromUint8Array(new Uint8Array(data.buffer, data.byteOffset, data.byteLength), width, height);
  const options = { colorDistanceFormula: 'euclidean-bt709-noalpha' as const };
  const palette = buildPaletteSync([points], { ...options, paletteQuantization: 'wuquant', colors: REPORT_PALETTE[kind] });
  const mapped = applyPaletteSync(points, palette, { ...options, imageQuantization: 'nearest' });
  const rgba = mapped.toUint8Array();
  const colours = palette.getPointContainer().getPointArray().length;
  // the pixels now hold at most `colours` values: the PNG encoder's palette keeps them as they are
  const png = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } })
    .removeAlpha()
    .png({ palette: true, colours: Math.max(2, colours), dither: 0, compressionLevel: 9, effort: 10 })
    .toBuffer();
  return { png, width, height, colours };
}
