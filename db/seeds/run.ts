// Seeds the demo lab: `tsx db/seeds/run.ts [--if-empty]`. With --if-empty it does nothing when
// any user exists, so a second `npm start` keeps the data as it is.
import { hashPassword } from '../../lib/auth/password';
import { closeDb, getDb } from '../index';
import { seedDemoCaptures } from './demo-captures';
import { DEMO_LAB, DEMO_PASSWORD, DEMO_PEOPLE, DEMO_PROJECTS } from './demo-data';

export async function seedDemo(): Promise<{ labId: string }> {
  const db = getDb();
  const hash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (trx) => {
    const [lab] = await trx('labs').insert({ name: DEMO_LAB }).returning<{ id: string }[]>('id');
    if (!lab) throw new Error('lab insert failed');
    for (const p of DEMO_PEOPLE) {
      // the demo people's addresses count as confirmed: they are invented and receive no mail
      const [u] = await trx('users').insert({ email: p.email, name: p.name, password_hash: hash, email_verified_at: trx.fn.now() }).returning<{ id: string }[]>('id');
      if (!u) throw new Error('user insert failed');
      await trx('memberships').insert({ lab_id: lab.id, user_id: u.id, role: p.role });
    }
    for (const proj of DEMO_PROJECTS) {
      const [row] = await trx('projects').insert({ lab_id: lab.id, name: proj.name, description: proj.description }).returning<{ id: string }[]>('id');
      if (!row) throw new Error('project insert failed');
      let position = 1;
      for (const r of proj.revisions) {
        await trx('revisions').insert({ lab_id: lab.id, project_id: row.id, label: r.label, position: position++, built_on: r.builtOn, status: r.status, notes: r.notes });
      }
      for (const t of proj.targets) {
        await trx('targets').insert({ lab_id: lab.id, project_id: row.id, metric: t.metric, comparator: t.comparator, value: t.value, condition_note: t.conditionNote, condition: JSON.stringify(t.condition), is_default: false });
      }
    }
    return { labId: lab.id };
  });
}

async function main(): Promise<void> {
  const ifEmpty = process.argv.includes('--if-empty');
  const db = getDb();
  if (ifEmpty) {
    const row = await db('users').count<{ count: string }[]>('* as count').first();
    if (Number(row?.count ?? 0) > 0) {
      console.log('database has data: demo seed skipped');
      return;
    }
  }
  const { labId } = await seedDemo();
  const tester = await db('users').where({ email: 'tester@example.test' }).first<{ id: string }>('id');
  const t0 = Date.now();
  const readings = process.argv.includes('--no-captures') ? 0 : await seedDemoCaptures(labId, tester.id);
  console.log(`seeded the demo lab "${DEMO_LAB}" with ${readings} analysed capture sets (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main()
    .catch((err: unknown) => {
      console.error(err instanceof Error ? err.message : err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
