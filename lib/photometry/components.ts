import type { Rect } from './types';

export interface Component {
  area: number;
  box: Rect;
}

/** 4-connected components of a binary mask with their areas and bounding boxes. */
export function connectedComponents(mask: Uint8Array, planeWidth: number, planeHeight: number): Component[] {
  if (mask.length !== planeWidth * planeHeight) throw new RangeError('mask does not match its size');
  // small integers from here on, whatever number representation the caller's sizes had
  const width = planeWidth | 0;
  const height = planeHeight | 0;
  const label = new Int32Array(width * height).fill(-1);
  const stack = new Int32Array(width * height);
  const out: Component[] = [];
  for (let start = 0; start < mask.length; start++) {
    if (mask[start] === 0 || (label[start] as number) >= 0) continue;
    const id = out.length;
    let top = 0;
    stack[top++] = start;
    label[start] = id;
    let area = 0;
    let x0 = width;
    let y0 = height;
    let x1 = -1;
    let y1 = -1;
    while (top > 0) {
      const p = stack[--top] as number;
      const y = (p / width) | 0;
      const x = p - y * width;
      area++;
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
      if (x > 0 && mask[p - 1] !== 0 && (label[p - 1] as number) < 0) { label[p - 1] = id; stack[top++] = p - 1; }
      if (x < width - 1 && mask[p + 1] !== 0 && (label[p + 1] as number) < 0) { label[p + 1] = id; stack[top++] = p + 1; }
      if (y > 0 && mask[p - width] !== 0 && (label[p - width] as number) < 0) { label[p - width] = id; stack[top++] = p - width; }
      if (y < height - 1 && mask[p + width] !== 0 && (label[p + width] as number) < 0) { label[p + width] = id; stack[top++] = p + width; }
    }
    out.push({ area, box: { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 } });
  }
  return out;
}
