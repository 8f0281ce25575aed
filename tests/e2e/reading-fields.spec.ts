// A reading of the current engine on its capture page: the detected ghost drawn on the photo where
// the reading puts it, and the newer reading fields (ghost SNR, edge zone, alignment to 0.1 px with
// the rotation) shown because the reading has them.
import { expect, test } from '@playwright/test';
import { closeDb, getDb } from '../../db/index';
import { signIn } from './helpers';

type Result = {
  screen: { x: number; y: number; w: number; h: number };
  image: { width: number; height: number };
  ghost: { dx: number; dy: number; ratio: number; snr: number | null; source: string } | null;
  edge?: { zone: number; spread: number };
  alignment?: { off?: { dx: number; dy: number; rotationDeg: number } };
};

test.afterAll(async () => {
  await closeDb();
});

test('the detected ghost is drawn where the reading found it, and the new reading fields are shown', async ({ browser }) => {
  test.setTimeout(60_000);
  const lab = await getDb()('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  // a demo reading with a detected ghost whose set's on photo has the reading's size
  const row = await getDb()('readings as g')
    .join('photos as p', function on() {
      this.on('p.capture_set_id', '=', 'g.capture_set_id').andOnVal('p.role', '=', 'on');
    })
    .where('g.lab_id', lab.id)
    .whereRaw(`g.result->'ghost'->>'source' = 'detected'`)
    .whereRaw(`jsonb_exists(g.result, 'alignment')`)
    .whereRaw(`(g.result->'image'->>'width')::int = p.width`)
    .orderBy('g.created_at', 'desc')
    .first<{ capture_set_id: string; analysis_id: string; result: Result }>('g.capture_set_id', 'g.analysis_id', 'g.result');
  expect(row, 'the demo seed analyses sets with ghosts using the current engine').toBeTruthy();
  const r = (row as { result: Result }).result;
  const g = r.ghost as NonNullable<Result['ghost']>;

  const page = await browser.newPage();
  await signIn(page, 'viewer@example.test');
  await page.goto(`/captures/${row?.capture_set_id}?analysis=${row?.analysis_id}`);
  const rect = page.getByTestId('detected-ghost').locator('rect');
  await expect(rect).toHaveCount(1);
  // the screen moved by the ghost's offset (the photo is larger than the ghost's reach here)
  expect(Number(await rect.getAttribute('x'))).toBeCloseTo(Math.max(0, r.screen.x + g.dx), 6);
  expect(Number(await rect.getAttribute('y'))).toBeCloseTo(Math.max(0, r.screen.y + g.dy), 6);
  await expect(page.getByTestId('detected-ghost-note')).toContainText(`${(100 * g.ratio).toFixed(2)}% of the display light`);

  const metrics = page.getByTestId('metrics');
  if (g.snr !== null) await expect(metrics.locator('[data-metric="ghost-snr"]')).toContainText(g.snr.toFixed(1));
  if (r.edge) await expect(metrics.locator('[data-metric="edge-zone"]')).toContainText(`edge spread ${r.edge.spread.toFixed(1)} px`);
  const off = r.alignment?.off;
  if (off) {
    const row = metrics.locator('[data-metric="align-off"]');
    await expect(row).toContainText(`${off.dx.toFixed(1)}, ${off.dy.toFixed(1)}`);
    await expect(row).toContainText(`rotation ${off.rotationDeg.toFixed(2)}°`);
  }
});
