// Demo capture sets: photos rendered from invented scenes by the test-photo generator, stored
// like uploads and measured by the real engine, so every demo reading is a true engine output.
import { createAnalysis } from '../queries/analyses';
import { createCaptureSet } from '../queries/capture-sets';
import { replaceRegions } from '../queries/regions';
import { ingestPhoto } from '../../lib/server/storage/ingest-photo';
import { getStackTemplate, type StackTemplateId } from '../../lib/optics';
import { renderCapturePhotos, seededRandom, type SceneOptions } from '../../tests/fixtures/capture-generator';
import { runAnalysis } from '../../worker/processors/run-analysis';
import { getDb } from '../index';

type Plan = {
  revision: string;
  template: StackTemplateId;
  variants: { variant: string; count: number; scene: SceneOptions }[];
};

const W = 960;
const H = 640;
const SCREEN = { x: 300, y: 190, w: 360, h: 240 };
const BACKGROUND = { x: 40, y: 40, w: 200, h: 140 };

// Invented optics: each later revision trades a little see-through for a brighter image or a
// weaker ghost, and the polarizer variant darkens the world more than the display.
export const DEMO_PLANS: Record<string, Plan[]> = {
  'Visor VX birdbath': [
    { revision: 'VX-A', template: 'birdbath', variants: [{ variant: 'without polarizer', count: 4, scene: { transmission: 0.25, displayLevel: 0.1, backgroundLevel: 0.4, ghost: { gain: 0.025, dx: 14, dy: 9 } } }] },
    {
      revision: 'VX-B',
      template: 'birdbath-polariser',
      variants: [
        { variant: 'without polarizer', count: 5, scene: { transmission: 0.3, displayLevel: 0.14, backgroundLevel: 0.4, ghost: { gain: 0.006, dx: 14, dy: 9 } } },
        { variant: 'with polarizer', count: 5, scene: { transmission: 0.16, displayLevel: 0.13, backgroundLevel: 0.4, ghost: { gain: 0.006, dx: 14, dy: 9 } } },
      ],
    },
    {
      revision: 'VX-C',
      template: 'birdbath-polariser',
      variants: [
        { variant: 'without polarizer', count: 3, scene: { transmission: 0.35, displayLevel: 0.22, backgroundLevel: 0.4, ghost: { gain: 0.004, dx: 14, dy: 9 } } },
        { variant: 'with polarizer', count: 3, scene: { transmission: 0.19, displayLevel: 0.21, backgroundLevel: 0.4, ghost: { gain: 0.004, dx: 14, dy: 9 } } },
      ],
    },
  ],
  'Ridgeline M2 helmet HUD': [
    { revision: 'M2-P1', template: 'single-combiner', variants: [{ variant: '', count: 4, scene: { transmission: 0.78, displayLevel: 0.2, backgroundLevel: 0.38, ghost: { gain: 0.04, dx: 22, dy: 0 } } }] },
  ],
};

/** Renders, stores and analyses the demo capture sets of one lab; returns how many readings it made. */
export async function seedDemoCaptures(labId: string, testerId: string, log: (line: string) => void = () => {}): Promise<number> {
  const db = getDb();
  let made = 0;
  let seed = 1;
  for (const [projectName, plans] of Object.entries(DEMO_PLANS)) {
    const project = await db('projects').where({ lab_id: labId, name: projectName }).first<{ id: string }>('id');
    await db('region_templates').insert({
      lab_id: labId,
      project_id: project.id,
      name: 'Bench jig A',
      image_width: W,
      image_height: H,
      regions: JSON.stringify([
        { kind: 'screen', ...SCREEN },
        { kind: 'background', ...BACKGROUND },
      ]),
    });
    for (const plan of plans) {
      const rev = await db('revisions').where({ lab_id: labId, project_id: project.id, label: plan.revision }).first<{ id: string }>('id');
      await db('revisions').where({ id: rev.id }).update({ stack: JSON.stringify(getStackTemplate(plan.template).stack) });
      for (const v of plan.variants) {
        for (let i = 0; i < v.count; i++) {
          const rnd = seededRandom(seed * 7919);
          const jitter = (x: number, share: number) => x * (1 + (rnd() * 2 - 1) * share);
          const scene: SceneOptions = {
            ...v.scene,
            width: W,
            height: H,
            seed: seed++,
            screen: SCREEN,
            background: BACKGROUND,
            displayLevel: jitter(v.scene.displayLevel ?? 0.1, 0.06),
            backgroundLevel: jitter(v.scene.backgroundLevel ?? 0.5, 0.04),
            shifts: { off: { dx: Math.round(rnd() * 2), dy: 0 } },
          };
          const photos = await renderCapturePhotos(scene);
          const label = `${plan.revision}${v.variant ? ` ${v.variant}` : ''} #${i + 1}`;
          const set = await createCaptureSet(labId, testerId, rev.id, {
            label,
            variant: v.variant,
            pattern: 'full',
            notes: 'Demo capture rendered from an invented scene.',
            backgroundCdm2: Math.round(jitter(1500, 0.3)),
            ambientLux: i === v.count - 1 && v.variant ? Math.round(jitter(20000, 0.1)) : Math.round(jitter(500, 0.3)),
            displayLevel: 'full white, 100%',
          });
          if (!set) throw new Error(`could not create ${label}`);
          for (const role of ['on', 'off', 'ambient'] as const) {
            await ingestPhoto({ labId, userId: testerId, captureSetId: set.id, role, name: `${label} ${role}.jpg`, bytes: photos[role] });
          }
          await replaceRegions(labId, testerId, set.id, [
            { kind: 'screen', ...SCREEN, source: 'marked' },
            { kind: 'background', ...BACKGROUND, source: 'marked' },
          ]);
          const analysis = await createAnalysis(labId, testerId, set.id);
          await runAnalysis(labId, analysis.id);
          made++;
          log(`  analysed ${projectName} / ${label}`);
        }
      }
    }
  }
  return made;
}
