import type { RgbImage } from '@/lib/patterns';

export function px(img: RgbImage, x: number, y: number): [number, number, number] {
  const i = (y * img.width + x) * 3;
  return [img.data[i]!, img.data[i + 1]!, img.data[i + 2]!];
}

export function grey(img: RgbImage, x: number, y: number): number {
  return img.data[(y * img.width + x) * 3]!;
}

export function mirrorX(img: RgbImage): RgbImage {
  const out = new Uint8Array(img.data.length);
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++) {
      const s = (y * img.width + x) * 3;
      const d = (y * img.width + (img.width - 1 - x)) * 3;
      out.set(img.data.subarray(s, s + 3), d);
    }
  return { ...img, data: out };
}

export function mirrorY(img: RgbImage): RgbImage {
  const out = new Uint8Array(img.data.length);
  const row = img.width * 3;
  for (let y = 0; y < img.height; y++) out.set(img.data.subarray(y * row, (y + 1) * row), (img.height - 1 - y) * row);
  return { ...img, data: out };
}

export function rotate180(img: RgbImage): RgbImage {
  return mirrorY(mirrorX(img));
}

/** 90° clockwise turn (swaps width and height). */
export function rotate90(img: RgbImage): RgbImage {
  const w = img.height;
  const h = img.width;
  const out = new Uint8Array(img.data.length);
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++) {
      const s = (y * img.width + x) * 3;
      const nx = img.height - 1 - y;
      const ny = x;
      out.set(img.data.subarray(s, s + 3), (ny * w + nx) * 3);
    }
  return { data: out, width: w, height: h, channels: 3 };
}

export function equal(a: RgbImage, b: RgbImage): boolean {
  if (a.width !== b.width || a.height !== b.height) return false;
  for (let i = 0; i < a.data.length; i++) if (a.data[i] !== b.data[i]) return false;
  return true;
}
