// The files of public/: the web manifest's icons exist at the sizes it states, the favicon and the
// touch icon the layout names are there, and robots.txt keeps crawlers out of everything past sign-in.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';

const pub = join(import.meta.dirname, '..', '..', 'public');

type Icon = { src: string; type: string; sizes: string; purpose?: string };

describe('public files', () => {
  it('has a web manifest whose icons exist with the sizes and types it states', async () => {
    const m = JSON.parse(readFileSync(join(pub, 'manifest.webmanifest'), 'utf8')) as { name: string; start_url: string; display: string; icons: Icon[] };
    expect(m.name).toBe('Veilmeter');
    expect(m.start_url).toBe('/');
    const purposes = new Set(m.icons.map((i) => i.purpose));
    expect(purposes).toEqual(new Set(['any', 'maskable']));
    for (const icon of m.icons) {
      const file = join(pub, icon.src);
      expect(existsSync(file), icon.src).toBe(true);
      const meta = await sharp(file).metadata();
      expect(meta.format).toBe(icon.type === 'image/svg+xml' ? 'svg' : 'png');
      if (icon.sizes !== 'any') expect(`${meta.width}x${meta.height}`).toBe(icon.sizes);
    }
    // a home screen needs at least 192 and 512 px PNGs
    expect(m.icons.filter((i) => i.type === 'image/png').map((i) => i.sizes)).toEqual(expect.arrayContaining(['192x192', '512x512']));
  });

  it('names only files that exist in the layout metadata', () => {
    // app/layout.tsx loads fonts through Next, so its metadata is read as text here
    const layout = readFileSync(join(pub, '..', 'app', 'layout.tsx'), 'utf8');
    const block = /export const metadata[\s\S]*?\n\};/.exec(layout)?.[0] ?? '';
    expect(block).toContain("manifest: '/manifest.webmanifest'");
    const urls = [...block.matchAll(/'(\/[\w.-]+\.(?:svg|png|webmanifest))'/g)].map((m) => m[1] as string);
    expect(urls).toEqual(expect.arrayContaining(['/manifest.webmanifest', '/icon.svg', '/icon-32.png', '/apple-touch-icon.png']));
    for (const url of urls) expect(existsSync(join(pub, url)), url).toBe(true);
  });

  it('lets crawlers see the sign-in page and nothing else', () => {
    const lines = readFileSync(join(pub, 'robots.txt'), 'utf8')
      .split('\n')
      .map((l) => l.replace(/#.*/, '').trim())
      .filter(Boolean);
    expect(lines).toEqual(['User-agent: *', 'Allow: /sign-in', 'Disallow: /']);
  });
});
