// Linear 16-bit TIFFs in the browser: the form says when to declare them, each photo says how it is
// read and why, and a photo can be set on its own.
import { expect, test, type Page } from '@playwright/test';
import sharp from 'sharp';
import { closeDb, getDb } from '../../db/index';
import { renderCapture } from '../fixtures/capture-generator';
import { encodeTiff16 } from '../fixtures/tiff16';
import { signIn } from './helpers';

type Payload = { name: string; type: string; bytes: number[] };
const stamp = Date.now();
let projectId = '';
let revisionId = '';
const files: Record<'on' | 'off' | 'ambient', Buffer> = {} as never;

async function dropFiles(page: Page, testId: string, list: Payload[]): Promise<void> {
  const dt = await page.evaluateHandle((items: Payload[]) => {
    const d = new DataTransfer();
    for (const f of items) d.items.add(new File([new Uint8Array(f.bytes)], f.name, { type: f.type }));
    return d;
  }, list);
  await page.getByTestId(testId).dispatchEvent('dragenter', { dataTransfer: dt });
  await page.getByTestId(testId).dispatchEvent('drop', { dataTransfer: dt });
}

/** The generator's sRGB-encoded 16-bit TIFF turned into linear codes (IEC 61966-2-1 decoding), with no colour profile. */
async function linearTiff(srgb: Buffer): Promise<Buffer> {
  const { data, info } = await sharp(srgb).toColourspace('rgb16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true });
  const codes = new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2);
  const lin = codes.map((c) => {
    const v = c / 65535;
    return Math.round(65535 * (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  });
  return encodeTiff16(lin, info.width, info.height);
}

test.beforeAll(async () => {
  const db = getDb();
  const lab = await db('labs').where({ name: 'Kestrel Row Optics Lab' }).first<{ id: string }>('id');
  const [project] = await db('projects').insert({ lab_id: lab.id, name: `Linear visor ${stamp}` }).returning<{ id: string }[]>('id');
  projectId = (project as { id: string }).id;
  const [rev] = await db('revisions').insert({ lab_id: lab.id, project_id: projectId, label: `LIN-${stamp}`, position: 1 }).returning<{ id: string }[]>('id');
  revisionId = (rev as { id: string }).id;
  const c = await renderCapture({ width: 160, height: 120, seed: stamp % 100_000, format: 'tiff16', ghost: null, exposures: { on: null, off: null, ambient: null } });
  files.on = await linearTiff(c.on);
  files.off = await linearTiff(c.off);
  files.ambient = await linearTiff(c.ambient);
});

test.afterAll(async () => {
  if (projectId) await getDb()('projects').where({ id: projectId }).delete();
  await closeDb();
});

test('16-bit linear TIFFs: the form explains the choice, each photo says how it is read, and one photo can be set apart', async ({ browser }) => {
  test.setTimeout(120_000);
  const page = await browser.newPage();
  await signIn(page, 'tester@example.test');
  await page.goto(`/projects/${projectId}/revisions/${revisionId}`);
  const form = page.getByRole('form', { name: 'New capture set' });
  await expect(form.getByTestId('tiff-encoding-help')).toContainText('16-bit TIFFs converted from camera raw with no gamma curve');
  await expect(form.getByLabel('16-bit TIFF encoding')).toHaveValue('auto');
  await form.getByLabel('Label').fill('Linear raw export');
  await form.getByRole('button', { name: 'Create capture set' }).click();
  await expect(page.getByTestId('capture-label')).toHaveText('Linear raw export');

  await dropFiles(page, 'multi-drop', [
    { name: `lin-${stamp}-on.tif`, type: 'image/tiff', bytes: [...files.on] },
    { name: `lin-${stamp}-off.tif`, type: 'image/tiff', bytes: [...files.off] },
    { name: `lin-${stamp}-world.tif`, type: 'image/tiff', bytes: [...files.ambient] },
  ]);
  await expect(page.getByTestId('upload-item').filter({ hasText: 'Uploaded.' })).toHaveCount(3, { timeout: 30_000 });
  const on = page.getByTestId('encoding-on');
  await expect(on).toHaveAttribute('data-linear', 'true');
  await expect(on).toContainText('Read as linear light (file: no colour profile');
  await expect(page.getByTestId('encoding-ambient')).toHaveAttribute('data-linear', 'true');

  await page.getByLabel('Encoding of the on photo').selectOption('srgb');
  await expect(on).toHaveAttribute('data-linear', 'false');
  await expect(on).toContainText('Read as sRGB-encoded (set for this photo)');
  await expect(page.getByTestId('encoding-off')).toHaveAttribute('data-linear', 'true');

  // the set's own setting, from the details form, now applies to the photos without their own
  await page.getByText('Edit label, variant, pattern and conditions').click();
  const edit = page.getByRole('form', { name: 'Edit capture set' });
  await edit.getByLabel('16-bit TIFF encoding').selectOption('srgb');
  await edit.getByRole('button', { name: 'Save capture set' }).click();
  await expect(edit.getByRole('status')).toContainText('Saved');
  await page.reload();
  await expect(page.getByTestId('encoding-off')).toContainText('Read as sRGB-encoded (as the capture set says)');
  await expect(page.getByText('16-bit TIFFs read as sRGB')).toBeVisible();
});
