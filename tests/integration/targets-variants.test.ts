import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { checkRevisionTargets, createTarget, deleteTarget, listProjectVariants, listTargets, updateTarget } from '../../db/queries/targets';
import { listNewestReadings } from '../../db/queries/trends';
import { createUserWithLab } from '../../db/queries/users';
import { uuidSchema } from '../../lib/schemas/common';
import { refineTarget, targetSchema, toTargetWrite } from '../../lib/schemas/target';
import { revisionVerdictText } from '../../lib/targets/evaluate';
import { notifyTargetFailures } from '../../lib/server/targets/notify';
import { insertFixtureProject, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// Real PostgreSQL; every number is invented. The fixture's capture sets state an ambient level of
// 4000 + n lx and the full-white pattern.
const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let fx: Fixture;
const formSchema = targetSchema.extend({ projectId: uuidSchema }).superRefine(refineTarget);

beforeAll(async () => {
  a = await createUserWithLab({ email: `va-${tag}@example.test`, name: 'Variant A', passwordHash: 'x', labName: `Variants A ${tag}` });
  b = await createUserWithLab({ email: `vb-${tag}@example.test`, name: 'Variant B', passwordHash: 'x', labName: `Variants B ${tag}` });
  fx = await insertFixtureProject(a.labId, `Variant visor ${tag}`, [
    {
      label: 'V-1',
      variants: [
        { variant: 'without polarizer', readings: [{ acr: 2.28, transmission: 0.76 }, { acr: 2.25, transmission: 0.75 }, { acr: 2.31, transmission: 0.77 }] },
        { variant: 'with polarizer', readings: [{ acr: 3.0, transmission: 0.44 }, { acr: 3.05, transmission: 0.45 }, { acr: 2.98, transmission: 0.43 }] },
      ],
    },
  ]);
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId], fx.projectId);
  await closeDb();
});

describe('targets per variant', () => {
  it('judge each variant on its own readings, never the blend that would pass', async () => {
    const rev = fx.revisions['V-1']!;
    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 2.5, conditionNote: '', isDefault: false });
    const checks = await checkRevisionTargets(a.labId, fx.projectId, rev.id);
    // the blend of all six captures has a mean of 2.645 and would pass
    expect(checks.map((c) => [c.variant, c.status, c.n])).toEqual([
      ['with polarizer', 'pass', 3],
      ['without polarizer', 'fail', 3],
    ]);
    expect(checks[1]!.mean).toBeCloseTo((2.28 + 2.25 + 2.31) / 3, 12);
    expect(revisionVerdictText(checks)).toBe('meets its target as “with polarizer”; fails 1 of 1 target as “without polarizer”');
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
  });

  it('judge a target that names variants only on those', async () => {
    const rev = fx.revisions['V-1']!;
    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'transmission', comparator: '>=', value: 0.7, conditionNote: '', variants: ['without polarizer'], isDefault: false });
    expect((await listTargets(a.labId, fx.projectId)).find((x) => x.id === t!.id)?.variants).toEqual(['without polarizer']);
    const checks = await checkRevisionTargets(a.labId, fx.projectId, rev.id);
    expect(checks.map((c) => [c.variant, c.status])).toEqual([['without polarizer', 'pass']]);
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
  });

  it('offer the project’s existing variants, and only this lab’s', async () => {
    expect(await listProjectVariants(a.labId, fx.projectId)).toEqual(['with polarizer', 'without polarizer']);
    expect(await listProjectVariants(b.labId, fx.projectId)).toEqual([]);
  });

  it('keep the state per variant, so a lead hears which variant turned to failing', async () => {
    const rev = fx.revisions['V-1']!;
    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 2.5, conditionNote: '', isDefault: false });
    const out = await notifyTargetFailures(a.labId, rev.id);
    expect(out.newlyFailing.map((c) => c.variant)).toEqual(['without polarizer']);
    const states = await getDb()('target_states').where({ lab_id: a.labId, target_id: t!.id }).orderBy('variant').select('variant', 'failing');
    expect(states).toEqual([
      { variant: 'with polarizer', failing: false },
      { variant: 'without polarizer', failing: true },
    ]);
    // judged again with nothing new: no news
    expect((await notifyTargetFailures(a.labId, rev.id)).newlyFailing).toEqual([]);
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
  });
});

describe('structured conditions', () => {
  it('store the condition beside the note and read it back', async () => {
    const input = toTargetWrite(formSchema.parse({ projectId: fx.projectId, metric: 'ghostRatio', comparator: '<=', value: '1', valueIn: 'shown', ambientLuxMin: '300', ambientLuxMax: '700', pattern: 'full', conditionNote: 'office desk', variants: 'with polarizer\nwithout polarizer' }));
    expect(input.value).toBeCloseTo(0.01, 12); // typed as 1 %, stored as a fraction
    const { projectId: _p, ...write } = input;
    const t = await createTarget(a.labId, a.userId, fx.projectId, write);
    const back = (await listTargets(a.labId, fx.projectId)).find((x) => x.id === t!.id)!;
    expect(back.condition).toEqual({ ambientLuxMin: 300, ambientLuxMax: 700, pattern: 'full' });
    expect(back.conditionNote).toBe('office desk');
    expect(back.variants).toEqual(['with polarizer', 'without polarizer']);
    const row = await getDb()('targets').where({ id: t!.id }).first('condition');
    expect(row.condition).toEqual({ ambientLuxMin: 300, ambientLuxMax: 700, pattern: 'full' });
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
  });

  it('refuse a range that runs backwards, a percentage over 100 and an unknown pattern, with a message each', () => {
    const r = formSchema.safeParse({ projectId: fx.projectId, metric: 'transmission', comparator: '>=', value: '130', valueIn: 'shown', ambientLuxMin: '700', ambientLuxMax: '300', pattern: 'stripes' });
    expect(r.success).toBe(false);
    const fields = Object.fromEntries((r.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));
    expect(fields.pattern).toMatch(/full white, checkerboard or slanted edge/);
    // the object-level checks run once the fields themselves parse
    const r2 = formSchema.safeParse({ projectId: fx.projectId, metric: 'transmission', comparator: '>=', value: '130', valueIn: 'shown', ambientLuxMin: '700', ambientLuxMax: '300' });
    const f2 = Object.fromEntries((r2.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));
    expect(f2.ambientLuxMax).toMatch(/must not be below the lowest/);
    expect(f2.value).toMatch(/cannot exceed 100 %/);
  });

  it('judge only the capture sets whose stated conditions meet the target, counting the rest', async () => {
    const rev = fx.revisions['V-1']!;
    // the first "with polarizer" capture was shot at window light and reads poorly
    const withSets = await getDb()('capture_sets').where({ lab_id: a.labId, revision_id: rev.id, variant: 'with polarizer' }).orderBy('label').select('id');
    await getDb()('capture_sets').where({ id: withSets[0]!.id }).update({ conditions: JSON.stringify({ ambientLux: 20000 }) });
    const noLux = await getDb()('capture_sets').where({ lab_id: a.labId, revision_id: rev.id, variant: 'without polarizer' }).orderBy('label').first('id');
    await getDb()('capture_sets').where({ id: noLux.id }).update({ conditions: JSON.stringify({}) });
    const readings = await listNewestReadings(a.labId, { projectId: fx.projectId, revisionId: rev.id });
    expect(readings.find((r) => r.captureSetId === withSets[0]!.id)?.conditions).toEqual({ pattern: 'full', ambientLux: 20000, backgroundCdm2: null });

    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 2.0, conditionNote: 'office', condition: { ambientLuxMin: 1000, ambientLuxMax: 10000 }, isDefault: false });
    const checks = await checkRevisionTargets(a.labId, fx.projectId, rev.id);
    const withP = checks.find((c) => c.variant === 'with polarizer')!;
    const without = checks.find((c) => c.variant === 'without polarizer')!;
    expect(withP).toMatchObject({ n: 2, excluded: 1, excludedWhy: ['ambient 20,000 lx'] });
    expect(withP.mean).toBeCloseTo((3.05 + 2.98) / 2, 12);
    expect(without).toMatchObject({ n: 2, excluded: 1, excludedWhy: ['ambient illuminance not stated'] });

    // a pattern the captures were not shot with leaves nothing to judge
    await updateTarget(a.labId, a.userId, fx.projectId, t!.id, { metric: 'ambientContrastRatio', comparator: '>=', value: 2.0, conditionNote: '', condition: { pattern: 'checkerboard' }, isDefault: false });
    const none = await checkRevisionTargets(a.labId, fx.projectId, rev.id);
    expect(none.map((c) => [c.status, c.n, c.excluded])).toEqual([
      ['no-data', 0, 3],
      ['no-data', 0, 3],
    ]);
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
    await getDb()('capture_sets').where({ id: withSets[0]!.id }).update({ conditions: JSON.stringify({ ambientLux: 4000 }) });
  });
});
