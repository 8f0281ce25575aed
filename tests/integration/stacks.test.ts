import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { getRevisionStack, listMeasuredForPlanner, listRevisionsWithStacks, saveRevisionStack } from '../../db/queries/stacks';
import { getStackTemplate } from '../../lib/optics';

// Two throwaway labs: every query must see its own lab's rows and nothing of the other's.
const tag = `stacks-it-${Date.now().toString(36)}`;
let labA = '';
let labB = '';
let userId = '';
let projectId = '';
let revisionId = '';
const stack = getStackTemplate('birdbath').stack;

beforeAll(async () => {
  const db = getDb();
  const [a] = await db('labs').insert({ name: `${tag} A` }).returning<{ id: string }[]>('id');
  const [b] = await db('labs').insert({ name: `${tag} B` }).returning<{ id: string }[]>('id');
  const [u] = await db('users').insert({ email: `${tag}@example.test`, name: 'Integration', password_hash: 'x' }).returning<{ id: string }[]>('id');
  if (!a || !b || !u) throw new Error('setup failed');
  labA = a.id;
  labB = b.id;
  userId = u.id;
  const [p] = await db('projects').insert({ lab_id: labA, name: `${tag} project` }).returning<{ id: string }[]>('id');
  if (!p) throw new Error('setup failed');
  projectId = p.id;
  const [r] = await db('revisions').insert({ lab_id: labA, project_id: projectId, label: 'R1', position: 1 }).returning<{ id: string }[]>('id');
  if (!r) throw new Error('setup failed');
  revisionId = r.id;
  const [cs] = await db('capture_sets').insert({ lab_id: labA, revision_id: revisionId, label: 'shot 1' }).returning<{ id: string }[]>('id');
  if (!cs) throw new Error('setup failed');
  for (const [age, bg] of [
    ['1 hour', 900],
    ['1 minute', 250],
  ] as const) {
    const [an] = await db('analyses').insert({ lab_id: labA, capture_set_id: cs.id, status: 'done' }).returning<{ id: string }[]>('id');
    if (!an) throw new Error('setup failed');
    await db('readings').insert({
      lab_id: labA,
      analysis_id: an.id,
      capture_set_id: cs.id,
      revision_id: revisionId,
      project_id: projectId,
      engine_version: 'it',
      ambient_contrast_ratio: 3.2,
      background_cdm2: bg,
      result: '{}',
      created_at: db.raw(`now() - interval '${age}'`),
    });
  }
});

afterAll(async () => {
  const db = getDb();
  await db('labs').whereIn('id', [labA, labB]).delete();
  await db('users').where({ id: userId }).delete();
  await closeDb();
});

describe('stack queries', () => {
  it('return the revision to its own lab and null to another lab', async () => {
    expect((await getRevisionStack(labA, projectId, revisionId))?.label).toBe('R1');
    expect(await getRevisionStack(labB, projectId, revisionId)).toBeNull();
    expect(await listRevisionsWithStacks(labB, projectId)).toEqual([]);
  });

  it('refuse to save into another lab’s revision and leave it unchanged', async () => {
    expect(await saveRevisionStack(labB, userId, revisionId, stack)).toBeNull();
    expect((await getRevisionStack(labA, projectId, revisionId))?.stack).toEqual({ elements: [] });
  });

  it('save a stack in its own lab and record who did it', async () => {
    const saved = await saveRevisionStack(labA, userId, revisionId, stack);
    expect(saved?.stack).toEqual(stack);
    const [list] = await listRevisionsWithStacks(labA, projectId);
    expect(list?.stack).toEqual(stack);
    const audit = await getDb()('audit_events').where({ lab_id: labA, action: 'stack.save', target_id: revisionId });
    expect(audit).toHaveLength(1);
  });

  it('list only the newest reading of each capture set, and nothing to another lab', async () => {
    const rows = await listMeasuredForPlanner(labA, projectId);
    expect(rows).toHaveLength(1);
    expect(rows[0]?.backgroundCdm2).toBe(250);
    expect(rows[0]?.revisionLabel).toBe('R1');
    expect(await listMeasuredForPlanner(labB, projectId)).toEqual([]);
  });
});
