import type { Lab } from './color';

const DEG = Math.PI / 180;

/** CIEDE2000 colour difference with kL = kC = kH = 1. */
export function deltaE2000(c1: Lab, c2: Lab): number {
  for (const v of [c1.l, c1.a, c1.b, c2.l, c2.a, c2.b]) if (!Number.isFinite(v)) throw new RangeError('Lab values must be finite');
  // Sharma, Wu & Dalal, Color Res. Appl. 30(1), 2005, equations (1)–(22)
  const cab1 = Math.hypot(c1.a, c1.b);
  const cab2 = Math.hypot(c2.a, c2.b);
  const cabMean = (cab1 + cab2) / 2;
  const c7 = Math.pow(cabMean, 7);
  const g = 0.5 * (1 - Math.sqrt(c7 / (c7 + Math.pow(25, 7))));
  const a1 = (1 + g) * c1.a;
  const a2 = (1 + g) * c2.a;
  const cp1 = Math.hypot(a1, c1.b);
  const cp2 = Math.hypot(a2, c2.b);
  const hue = (b: number, a: number): number => {
    if (a === 0 && b === 0) return 0;
    const h = Math.atan2(b, a) / DEG;
    return h < 0 ? h + 360 : h;
  };
  const hp1 = hue(c1.b, a1);
  const hp2 = hue(c2.b, a2);

  const dL = c2.l - c1.l;
  const dC = cp2 - cp1;
  let dh = 0;
  if (cp1 * cp2 !== 0) {
    dh = hp2 - hp1;
    if (dh > 180) dh -= 360;
    else if (dh < -180) dh += 360;
  }
  const dH = 2 * Math.sqrt(cp1 * cp2) * Math.sin((dh / 2) * DEG);

  const lMean = (c1.l + c2.l) / 2;
  const cpMean = (cp1 + cp2) / 2;
  let hMean = hp1 + hp2;
  if (cp1 * cp2 !== 0) {
    if (Math.abs(hp1 - hp2) <= 180) hMean = (hp1 + hp2) / 2;
    else hMean = hp1 + hp2 < 360 ? (hp1 + hp2 + 360) / 2 : (hp1 + hp2 - 360) / 2;
  }
  const t =
    1 -
    0.17 * Math.cos((hMean - 30) * DEG) +
    0.24 * Math.cos(2 * hMean * DEG) +
    0.32 * Math.cos((3 * hMean + 6) * DEG) -
    0.2 * Math.cos((4 * hMean - 63) * DEG);
  const dTheta = 30 * Math.exp(-Math.pow((hMean - 275) / 25, 2));
  const cp7 = Math.pow(cpMean, 7);
  const rc = 2 * Math.sqrt(cp7 / (cp7 + Math.pow(25, 7)));
  const l50 = (lMean - 50) * (lMean - 50);
  const sl = 1 + (0.015 * l50) / Math.sqrt(20 + l50);
  const sc = 1 + 0.045 * cpMean;
  const sh = 1 + 0.015 * cpMean * t;
  const rt = -Math.sin(2 * dTheta * DEG) * rc;
  const tl = dL / sl;
  const tc = dC / sc;
  const th = dH / sh;
  return Math.sqrt(tl * tl + tc * tc + th * th + rt * tc * th);
}
