import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { createProject, deleteProject, getProject, listProjects, updateProject } from '../../db/queries/projects';
import { createUserWithLab, getMembership, listMemberships } from '../../db/queries/users';

// Real PostgreSQL: every project query is scoped by the acting lab.
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
const tag = `${process.pid}-${Date.now()}`;

beforeAll(async () => {
  a = await createUserWithLab({ email: `qa-${tag}@example.test`, name: 'QA A', passwordHash: 'x', labName: `Lab A ${tag}` });
  b = await createUserWithLab({ email: `qb-${tag}@example.test`, name: 'QA B', passwordHash: 'x', labName: `Lab B ${tag}` });
});

afterAll(async () => {
  await getDb()('labs').whereIn('id', [a.labId, b.labId]).delete();
  await getDb()('users').whereIn('id', [a.userId, b.userId]).delete();
  await closeDb();
});

describe('project queries', () => {
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
