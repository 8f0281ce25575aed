import sharp from 'sharp';

/**
 * The MTF curve of a reading as a PNG for the PDF report: frequency 0–1 cycle per camera pixel
 * across, MTF 0 to the curve's top up, a grid every 0.1, MTF = 0.5 dashed, the camera's Nyquist
 * frequency (0.5) dotted and MTF50 marked. The caption beside it says the same in words, so the
 * figure reads even where the renderer has no font for its labels.
 */
export async function mtfPlotPng(curve: readonly { f: number; mtf: number }[], mtf50: number, size: { width: number; height: number } = { width: 900, height: 480 }): Promise<{ png: Buffer; width: number; height: number }> {
  if (curve.length < 2) throw new RangeError('the MTF curve needs at least two points');
  const { width: W, height: H } = size;
  const left = 70;
  const right = 24;
  const top = 20;
  const bottom = 60;
  const pw = W - left - right;
  const ph = H - top - bottom;
  const yMax = Math.max(1, Math.ceil(Math.max(...curve.map((p) => p.mtf)) * 10) / 10);
  const x = (f: number): number => left + pw * Math.min(1, Math.max(0, f));
  const y = (m: number): number => top + ph * (1 - Math.min(yMax, Math.max(0, m)) / yMax);
  const grid: string[] = [];
  for (let i = 0; i <= 10; i++) {
    const f = i / 10;
    grid.push(`<line x1="${x(f)}" y1="${top}" x2="${x(f)}" y2="${top + ph}" stroke="#d0d4da" stroke-width="1"/>`);
    grid.push(`<text x="${x(f)}" y="${top + ph + 20}" font-size="15" text-anchor="middle">${f.toFixed(1)}</text>`);
  }
  for (let m = 0; m <= yMax + 1e-9; m += 0.1) {
    grid.push(`<line x1="${left}" y1="${y(m)}" x2="${left + pw}" y2="${y(m)}" stroke="#d0d4da" stroke-width="1"/>`);
    if (Math.round(m * 10) % 2 === 0) grid.push(`<text x="${left - 8}" y="${y(m) + 5}" font-size="15" text-anchor="end">${m.toFixed(1)}</text>`);
  }
  const path = curve.map((p, i) => `${i === 0 ? 'M' : 'L'}${x(p.f).toFixed(1)},${y(p.mtf).toFixed(1)}`).join(' ');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" font-family="DejaVu Sans, sans-serif" fill="#1f2933">
<rect width="${W}" height="${H}" fill="#ffffff"/>
${grid.join('\n')}
<line x1="${left}" y1="${y(0.5)}" x2="${left + pw}" y2="${y(0.5)}" stroke="#52606d" stroke-width="1.5" stroke-dasharray="8 6"/>
<line x1="${x(0.5)}" y1="${top}" x2="${x(0.5)}" y2="${top + ph}" stroke="#52606d" stroke-width="1.5" stroke-dasharray="2 5"/>
<rect x="${left}" y="${top}" width="${pw}" height="${ph}" fill="none" stroke="#52606d" stroke-width="1.5"/>
<path d="${path}" fill="none" stroke="#0b6bcb" stroke-width="3"/>
<circle cx="${x(mtf50)}" cy="${y(0.5)}" r="7" fill="#d55e00" stroke="#ffffff" stroke-width="2"/>
<text x="${x(mtf50) + 12}" y="${y(0.5) - 10}" font-size="16">MTF50 ${mtf50.toFixed(3)}</text>
<text x="${left + pw / 2}" y="${H - 12}" font-size="16" text-anchor="middle">spatial frequency (cycles per camera pixel)</text>
<text x="18" y="${top + ph / 2}" font-size="16" text-anchor="middle" transform="rotate(-90 18 ${top + ph / 2})">MTF</text>
</svg>`;
  const png = await sharp(Buffer.from(svg)).png({ palette: true, colours: 32 }).toBuffer();
  return { png, width: W, height: H };
}
