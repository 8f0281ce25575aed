import knexFactory, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrationConfig as migrations } from '../../db/migration-source';
import { getEnv } from '../../lib/env';

// Runs against a scratch database on the test cluster so the shared one is left alone.
const name = `vm_migr_${process.pid}_${Date.now()}`;
let admin: Knex;
let scratch: Knex;

beforeAll(async () => {
  admin = knexFactory({ client: 'pg', connection: getEnv().DATABASE_URL, pool: { min: 0, max: 1 } });
  await admin.raw(`CREATE DATABASE ${name}`);
  const url = new URL(getEnv().DATABASE_URL);
  url.pathname = `/${name}`;
  scratch = knexFactory({ client: 'pg', connection: url.toString(), pool: { min: 0, max: 2 } });
});

afterAll(async () => {
  await scratch?.destroy();
  await admin?.raw(`DROP DATABASE IF EXISTS ${name}`);
  await admin?.destroy();
});

const tables = async (db: Knex) =>
  (await db.raw<{ rows: { tablename: string }[] }>(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT LIKE 'knex_%' ORDER BY 1`)).rows.map((r) => r.tablename);

describe('migrations', () => {
  it('create every table the design names, roll back to nothing and apply again', async () => {
    await scratch.migrate.latest(migrations);
    const up = await tables(scratch);
    for (const t of ['users', 'labs', 'memberships', 'invitations', 'api_tokens', 'projects', 'targets', 'revisions', 'capture_sets', 'photos', 'regions', 'region_templates', 'analyses', 'readings', 'audit_events']) {
      expect(up).toContain(t);
    }
    await scratch.migrate.rollback(migrations, true);
    expect(await tables(scratch)).toEqual([]);
    await scratch.migrate.latest(migrations);
    expect(await tables(scratch)).toEqual(up);
  });

  it('enforce one photo per sha256 per lab and one reading per analysis', async () => {
    const [lab] = await scratch('labs').insert({ name: 'Scratch lab' }).returning('id');
    const [other] = await scratch('labs').insert({ name: 'Other lab' }).returning('id');
    const [project] = await scratch('projects').insert({ lab_id: lab.id, name: 'P' }).returning('id');
    const [rev] = await scratch('revisions').insert({ lab_id: lab.id, project_id: project.id, label: 'R1', position: 1 }).returning('id');
    const [set] = await scratch('capture_sets').insert({ lab_id: lab.id, revision_id: rev.id, label: 'C1' }).returning('id');
    const photo = { capture_set_id: set.id, role: 'on', storage_key: 'k1', sha256: 'a'.repeat(64), bytes: 10, width: 4, height: 4, format: 'jpeg' };
    await scratch('photos').insert({ ...photo, lab_id: lab.id });
    await expect(scratch('photos').insert({ ...photo, lab_id: lab.id, storage_key: 'k2' })).rejects.toMatchObject({ code: '23505' });

    const [otherProject] = await scratch('projects').insert({ lab_id: other.id, name: 'P' }).returning('id');
    const [otherRev] = await scratch('revisions').insert({ lab_id: other.id, project_id: otherProject.id, label: 'R1', position: 1 }).returning('id');
    const [otherSet] = await scratch('capture_sets').insert({ lab_id: other.id, revision_id: otherRev.id, label: 'C1' }).returning('id');
    await scratch('photos').insert({ ...photo, lab_id: other.id, capture_set_id: otherSet.id, storage_key: 'k3' });

    const [analysis] = await scratch('analyses').insert({ lab_id: lab.id, capture_set_id: set.id }).returning('id');
    const reading = { lab_id: lab.id, analysis_id: analysis.id, capture_set_id: set.id, revision_id: rev.id, project_id: project.id, engine_version: '1.0.0', result: '{}' };
    await scratch('readings').insert(reading);
    await expect(scratch('readings').insert(reading)).rejects.toMatchObject({ code: '23505' });

    await scratch('projects').where({ id: project.id }).delete();
    expect(await scratch('readings').where({ project_id: project.id })).toHaveLength(0);
    expect(await scratch('photos').where({ lab_id: lab.id })).toHaveLength(0);
    expect(await scratch('photos').where({ lab_id: other.id })).toHaveLength(1);
  });

  it('refuses a region of zero size', async () => {
    const set = await scratch('capture_sets').first('id', 'lab_id');
    await expect(scratch('regions').insert({ lab_id: set.lab_id, capture_set_id: set.id, kind: 'screen', x: 0, y: 0, w: 0, h: 10 })).rejects.toMatchObject({ code: '23514' });
  });
});
