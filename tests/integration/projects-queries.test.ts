import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { createProject, deleteProject, getProject, listProjectLatest, listProjects, updateProject } from '../../db/queries/projects';
import { createUserWithLab, getMembership, listMemberships } from '../../db/queries/users';
import { insertFixtureProject, insertReading, removeTestLabs } from '../fixtures/readings-fixture';

// Real PostgreSQL: every project query is scoped by the acting lab.
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
const tag = `${process.pid}-${Date.now()}`;

beforeAll(async () => {
  a = await createUserWithLab({ email: `qa-${tag}@example.test`, name: 'QA A', passwordHash: 'x', labName: `Lab A ${tag}` });
  b = await createUserWithLab({ email: `qb-${tag}@example.test`, name: 'QA B', passwordHash: 'x', labName: `Lab B ${tag}` });
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId]);
  await closeDb();
});

describe('project queries', () => {
  it('give each project its highest-placed revision with readings, and means over the newest reading of each capture set', async () => {
    // invented readings: R2 is the newest revision with readings; R3 has none
    const fx = await insertFixtureProject(a.labId, `Latest ${tag}`, [
      { label: 'R1', variants: [{ variant: '', readings: [{ acr: 1.5, ghost: 0.05 }, { acr: 1.7, ghost: 0.03 }] }] },
      { label: 'R2', variants: [{ variant: 'bare', readings: [{ acr: 2, ghost: 0.02, transmission: 0.4 }] }, { variant: 'coated', readings: [{ acr: 3, ghost: 0.01 }] }] },
    ]);
    await getDb()('revisions').insert({ lab_id: a.labId, project_id: fx.projectId, label: 'R3', position: 3, status: 'planned' });
    const r2 = fx.revisions.R2 as { id: string; captureSetIds: string[] };
    // a newer re-run of the first R2 set replaces its figures in the means
    await insertReading(a.labId, fx.projectId, r2.id, r2.captureSetIds[0] as string, { acr: 2.5, ghost: 0.03, transmission: 0.5 }, new Date(Date.now() + 60_000));
    const latest = (await listProjectLatest(a.labId)).get(fx.projectId);
    expect(latest).toMatchObject({ revisionLabel: 'R2', captures: 2 });
    expect(latest?.acr).toBeCloseTo((2.5 + 3) / 2, 12);
    expect(latest?.ghost).toBeCloseTo((0.03 + 0.01) / 2, 12);
    // transmission of the coated set is missing: the mean is over the one set that has it
    expect(latest?.transmission).toBeCloseTo(0.5, 12);
    expect((await listProjectLatest(b.labId)).has(fx.projectId)).toBe(false);
    const empty = await createProject(a.labId, a.userId, { name: `No readings ${tag}` });
    expect((await listProjectLatest(a.labId)).has(empty.id)).toBe(false);
  });

  it('make the creator of a lab its admin', async () => {
    expect(await getMembership(a.userId, a.labId)).toMatchObject({ role: 'admin' });
    expect(await getMembership(a.userId, b.labId)).toBeNull();
    expect(await listMemberships(a.userId)).toHaveLength(1);
  });

  it('never show, change or delete another lab’s project', async () => {
    const p = await createProject(a.labId, a.userId, { name: 'Scoped visor' });
    expect((await listProjects(a.labId)).map((x) => x.id)).toContain(p.id);
    expect((await listProjects(b.labId)).map((x) => x.id)).not.toContain(p.id);
    expect(await getProject(b.labId, p.id)).toBeNull();
    expect(await updateProject(b.labId, b.userId, p.id, { name: 'Taken' })).toBeNull();
    expect(await deleteProject(b.labId, b.userId, p.id)).toBe(false);
    expect((await getProject(a.labId, p.id))?.name).toBe('Scoped visor');
  });

  it('refuse a duplicate name inside one lab but allow it in another', async () => {
    await createProject(a.labId, a.userId, { name: 'Twin' });
    await expect(createProject(a.labId, a.userId, { name: 'Twin' })).rejects.toMatchObject({ code: '23505' });
    await expect(createProject(b.labId, b.userId, { name: 'Twin' })).resolves.toMatchObject({ name: 'Twin' });
  });

  it('write an audit event with each change', async () => {
    const p = await createProject(a.labId, a.userId, { name: 'Audited' });
    await updateProject(a.labId, a.userId, p.id, { name: 'Audited 2' });
    await deleteProject(a.labId, a.userId, p.id);
    const actions = (await getDb()('audit_events').where({ lab_id: a.labId, target_id: p.id }).orderBy('id')).map((e) => e.action);
    expect(actions).toEqual(['project.create', 'project.update', 'project.delete']);
  });
});
