// Renders the app's PNG icons from public/icon.svg with sharp: the favicon, the home-screen icons of
// the web manifest (public/manifest.webmanifest) and a maskable one whose art sits inside the
// central 80% that launchers keep. Run after changing the SVG: node scripts/make-icons.mjs
import { readFile, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';

const pub = join(dirname(fileURLToPath(import.meta.url)), '..', 'public');
const svg = await readFile(join(pub, 'icon.svg'), 'utf8');

// the same art without rounded corners, shrunk to 80% on a full-bleed square, for maskable icons
const inner = svg.replace(/^[\s\S]*?<svg[^>]*>/, '').replace(/<\/svg>\s*$/, '').replace(/rx="14"/, 'rx="0"');
const maskable = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 64 64"><rect width="64" height="64" fill="#0c1016"/><g transform="translate(6.4 6.4) scale(0.8)">${inner}</g></svg>`;

const outputs = [
  ['icon-32.png', svg, 32],
  ['apple-touch-icon.png', svg, 180],
  ['icon-192.png', svg, 192],
  ['icon-512.png', svg, 512],
  ['icon-maskable-512.png', maskable, 512],
];

for (const [name, source, size] of outputs) {
  // rendered at the target size from the vector (density scales the 64-unit viewBox), not scaled down
  const png = await sharp(Buffer.from(source), { density: (72 * size) / 64 })
    .resize(size, size)
    .png({ compressionLevel: 9, palette: size <= 32 })
    .toBuffer();
  await writeFile(join(pub, name), png);
  console.log(`${name} ${size} × ${size}, ${png.length} bytes`);
}
