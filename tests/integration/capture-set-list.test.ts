import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { listCaptureSets } from '../../db/queries/capture-sets';
import { createUserWithLab } from '../../db/queries/users';
import { insertFixtureProject, insertReading, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// The revision page's table of capture sets: each row carries its newest reading's figures.
// Invented values throughout.
const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let fx: Fixture;

beforeAll(async () => {
  a = await createUserWithLab({ email: `csl-a-${tag}@example.test`, name: 'List A', passwordHash: 'x', labName: `List A ${tag}` });
  b = await createUserWithLab({ email: `csl-b-${tag}@example.test`, name: 'List B', passwordHash: 'x', labName: `List B ${tag}` });
  fx = await insertFixtureProject(a.labId, `Capture list ${tag}`, [
    { label: 'R1', variants: [{ variant: '', readings: [{ acr: 2.1, ghost: 0.02, transmission: 0.3, uniformity: 0.91 }, { acr: 2.4, ghost: 0.01, transmission: 0.31, uniformity: 0.93 }] }] },
  ]);
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId], fx.projectId);
  await closeDb();
});

describe('listCaptureSets', () => {
  it('gives each capture set the figures of its newest reading, and nulls where it has none', async () => {
    const rev = fx.revisions.R1 as { id: string; captureSetIds: string[] };
    const [first, second] = rev.captureSetIds as [string, string];
    // a re-run of the first set, newer than every other reading, with other figures
    const later = new Date(Date.now() + 60_000);
    await insertReading(a.labId, fx.projectId, rev.id, first, { acr: 3.05, ghost: 0.004, transmission: 0.42 }, later);
    const [empty] = await getDb()('capture_sets').insert({ lab_id: a.labId, revision_id: rev.id, label: 'not analysed yet', variant: '' }).returning<{ id: string }[]>('id');

    const sets = await listCaptureSets(a.labId, rev.id);
    const byId = new Map(sets.map((s) => [s.id, s]));
    expect(sets).toHaveLength(3);
    expect(byId.get(first)).toMatchObject({ latestAcr: 3.05, latestGhost: 0.004, latestTransmission: 0.42, latestUniformity: null });
    expect(byId.get(first)?.latestReadingAt?.getTime()).toBe(later.getTime());
    expect(byId.get(second)).toMatchObject({ latestAcr: 2.4, latestGhost: 0.01, latestTransmission: 0.31, latestUniformity: 0.93 });
    expect(byId.get(empty?.id as string)).toMatchObject({ latestAcr: null, latestGhost: null, latestTransmission: null, latestUniformity: null, latestReadingAt: null, photoCount: 0 });
    // the lab's own rows only
    expect(await listCaptureSets(b.labId, rev.id)).toEqual([]);
  });

  it('names a set\'s photo roles in the order they are shot (on, off, ambient, dark)', async () => {
    const rev = fx.revisions.R1 as { id: string; captureSetIds: string[] };
    const setId = rev.captureSetIds[1] as string;
    // stored in an order the database would otherwise give back alphabetically
    for (const [k, role] of (['dark', 'ambient', 'off', 'on'] as const).entries()) {
      await getDb()('photos').insert({ lab_id: a.labId, capture_set_id: setId, role, storage_key: `k-${tag}-${role}`, sha256: String(k).repeat(64), bytes: 1, width: 1, height: 1, format: 'jpeg' });
    }
    const set = (await listCaptureSets(a.labId, rev.id)).find((s) => s.id === setId);
    expect(set?.photoCount).toBe(4);
    expect(set?.roles).toEqual(['on', 'off', 'ambient', 'dark']);
  });
});
