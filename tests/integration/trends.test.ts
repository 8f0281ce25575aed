import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb } from '../../db/index';
import { getComparisonGroup, listGroupOptions } from '../../db/queries/comparisons';
import { getProjectTrend } from '../../db/queries/trends';
import { createUserWithLab } from '../../db/queries/users';
import { summarise } from '../../lib/stats';
import { insertFixtureProject, insertReading, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// Invented readings in real PostgreSQL.
const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let fx: Fixture;

beforeAll(async () => {
  a = await createUserWithLab({ email: `ra-${tag}@example.test`, name: 'Trend A', passwordHash: 'x', labName: `Trends A ${tag}` });
  b = await createUserWithLab({ email: `rb-${tag}@example.test`, name: 'Trend B', passwordHash: 'x', labName: `Trends B ${tag}` });
  fx = await insertFixtureProject(a.labId, `Trend visor ${tag}`, [
    { label: 'R-1', variants: [{ variant: '', readings: [{ acr: 1.2 }, { acr: 1.22 }, { acr: 1.25 }] }] },
    { label: 'R-2', variants: [{ variant: 'a', readings: [{ acr: 1.3 }, { acr: 1.33 }] }, { variant: 'b', readings: [{ acr: 1.5 }, { acr: 1.52 }, { acr: 1.49 }] }] },
    { label: 'R-3', variants: [] },
  ]);
  // a newer re-run replaces the first capture's value in every statistic
  await insertReading(a.labId, fx.projectId, fx.revisions['R-1']!.id, fx.revisions['R-1']!.captureSetIds[0]!, { acr: 1.18 }, new Date(Date.now() + 60_000));
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId], fx.projectId);
  await closeDb();
});

describe('project trend', () => {
  it('uses the newest reading of each capture set, revisions in order', async () => {
    const t = await getProjectTrend(a.labId, fx.projectId);
    const acr = t!.trends.ambientContrastRatio.revisions;
    expect(acr.map((r) => r.label)).toEqual(['R-1', 'R-2', 'R-3']);
    expect(acr[0]!.points.map((p) => p.value).sort()).toEqual([1.18, 1.22, 1.25]);
    const s = summarise([1.18, 1.22, 1.25]);
    expect(acr[0]!.stats.mean).toBeCloseTo(s.mean, 14);
    expect(acr[0]!.stats.high).toBeCloseTo(s.ci!.high, 14);
    expect(acr[1]!.stats.n).toBe(5);
    expect(acr[2]!.stats.n).toBe(0);
  });

  it('is invisible to another lab', async () => {
    expect(await getProjectTrend(b.labId, fx.projectId)).toBeNull();
  });
});

describe('comparison groups', () => {
  it('offer each revision and, where it has several, each variant', async () => {
    const opts = await listGroupOptions(a.labId, fx.projectId);
    expect(opts.map((o) => o.label)).toEqual(['R-1 (all captures)', 'R-2 (all captures)', 'R-2 · a', 'R-2 · b']);
    expect(opts.find((o) => o.label === 'R-2 · b')?.captures).toBe(3);
    expect(await listGroupOptions(b.labId, fx.projectId)).toEqual([]);
  });

  it('narrow to a variant and refuse another lab', async () => {
    const g = await getComparisonGroup(a.labId, fx.projectId, { revisionId: fx.revisions['R-2']!.id, variant: 'b' });
    expect(g?.readings.map((r) => r.values.ambientContrastRatio).sort()).toEqual([1.49, 1.5, 1.52]);
    expect(g?.label).toBe('R-2 · b');
    expect(await getComparisonGroup(b.labId, fx.projectId, { revisionId: fx.revisions['R-2']!.id, variant: null })).toBeNull();
  });
});
