import { readdir, readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, getDb } from '../../db/index';
import { createTarget, deleteTarget, listProjectTargetStatus, listTargets, updateTarget, checkRevisionTargets } from '../../db/queries/targets';
import { createUserWithLab } from '../../db/queries/users';
import { targetSchema } from '../../lib/schemas/target';
import { notifyTargetFailures } from '../../lib/server/targets/notify';
import { insertFixtureProject, insertReading, type Fixture, removeTestLabs } from '../fixtures/readings-fixture';

// Real PostgreSQL and the local mail catcher; every number here is invented.
const tag = `${process.pid}-${Date.now()}`;
let a: { userId: string; labId: string };
let b: { userId: string; labId: string };
let fx: Fixture;
let clock = Date.now();
const later = () => new Date((clock += 1000));
const leadEmail = `lead-${tag}@example.test`;
let leadId: string;

async function mailsTo(to: string, subject: RegExp): Promise<{ subject: string; text: string }[]> {
  const dir = `${process.env.DATA_DIR}/mail`;
  const out: { subject: string; text: string }[] = [];
  for (const f of (await readdir(dir).catch(() => [] as string[])).filter((x) => x.endsWith('.json'))) {
    const m = JSON.parse(await readFile(`${dir}/${f}`, 'utf8')) as { to: string[]; subject: string; text: string };
    if (m.to.includes(to) && subject.test(m.subject)) out.push(m);
  }
  return out;
}

async function waitForCount(to: string, subject: RegExp, n: number): Promise<{ subject: string; text: string }[]> {
  const deadline = Date.now() + 8000;
  for (;;) {
    const got = await mailsTo(to, subject);
    if (got.length >= n || Date.now() > deadline) return got;
    await new Promise((r) => setTimeout(r, 150));
  }
}

beforeAll(async () => {
  a = await createUserWithLab({ email: `ta-${tag}@example.test`, name: 'Target A', passwordHash: 'x', labName: `Targets A ${tag}` });
  b = await createUserWithLab({ email: `tb-${tag}@example.test`, name: 'Target B', passwordHash: 'x', labName: `Targets B ${tag}` });
  const [u] = await getDb()('users').insert({ email: leadEmail, name: 'Lead of A', password_hash: 'x' }).returning<{ id: string }[]>('id');
  leadId = u!.id;
  await getDb()('memberships').insert({ lab_id: a.labId, user_id: leadId, role: 'lead' });
  fx = await insertFixtureProject(a.labId, `Target visor ${tag}`, [
    { label: 'T-1', variants: [{ variant: '', readings: [{ acr: 1.25 }, { acr: 1.3 }, { acr: 1.28 }] }] },
    { label: 'T-2', variants: [{ variant: '', readings: [{ acr: 1.4 }, { acr: 1.45 }, { acr: 1.42 }] }] },
  ]);
});

afterAll(async () => {
  await removeTestLabs([a.labId, b.labId], [a.userId, b.userId, leadId], fx.projectId);
  await closeDb();
});

describe('target schema', () => {
  it('refuses bad input with a message per field', () => {
    const r = targetSchema.safeParse({ metric: 'brightness', comparator: '>', value: 'lots', conditionNote: 'x'.repeat(400) });
    expect(r.success).toBe(false);
    const fields = new Set(r.error?.issues.map((i) => String(i.path[0])));
    expect([...fields].sort()).toEqual(['comparator', 'conditionNote', 'metric', 'value']);
    expect(targetSchema.safeParse({ metric: 'ambientContrastRatio', comparator: '>=', value: '' }).success).toBe(false);
    expect(targetSchema.parse({ metric: 'ambientContrastRatio', comparator: '>=', value: '1.2' })).toMatchObject({ value: 1.2, conditionNote: '', isDefault: false });
  });
});

describe('target queries', () => {
  it('create, edit and delete only inside the lab', async () => {
    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ghostRatio', comparator: '<=', value: 0.02, conditionNote: 'office light', isDefault: false });
    expect(t).toMatchObject({ metric: 'ghostRatio', value: 0.02 });
    expect(await createTarget(b.labId, b.userId, fx.projectId, { metric: 'ghostRatio', comparator: '<=', value: 0.02, conditionNote: '', isDefault: false })).toBeNull();
    expect(await listTargets(b.labId, fx.projectId)).toEqual([]);
    expect(await updateTarget(b.labId, b.userId, fx.projectId, t!.id, { metric: 'ghostRatio', comparator: '<=', value: 0.5, conditionNote: '', isDefault: false })).toBeNull();
    expect(await deleteTarget(b.labId, b.userId, fx.projectId, t!.id)).toBe(false);
    expect((await updateTarget(a.labId, a.userId, fx.projectId, t!.id, { metric: 'ghostRatio', comparator: '<=', value: 0.01, conditionNote: 'office', isDefault: false }))?.value).toBe(0.01);
    expect(await deleteTarget(a.labId, a.userId, fx.projectId, t!.id)).toBe(true);
    expect(await listTargets(a.labId, fx.projectId)).toEqual([]);
  });

  it('judge revisions and the project on the latest measured revision', async () => {
    const t = await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 1.35, conditionNote: '', isDefault: false });
    const r1 = await checkRevisionTargets(a.labId, fx.projectId, fx.revisions['T-1']!.id);
    const r2 = await checkRevisionTargets(a.labId, fx.projectId, fx.revisions['T-2']!.id);
    expect(r1[0]?.status).toBe('fail');
    expect(r2[0]?.status).toBe('pass');
    const status = (await listProjectTargetStatus(a.labId)).get(fx.projectId);
    expect(status?.revisionLabel).toBe('T-2');
    expect(status?.checks[0]?.status).toBe('pass');
    expect((await listProjectTargetStatus(b.labId)).get(fx.projectId)).toBeUndefined();
    await deleteTarget(a.labId, a.userId, fx.projectId, t!.id);
  });
});

describe('target failure mail', () => {
  it('reaches the leads once when a revision turns to failing, not on every reading after', async () => {
    const rev = fx.revisions['T-2']!;
    await createTarget(a.labId, a.userId, fx.projectId, { metric: 'ambientContrastRatio', comparator: '>=', value: 1.4, conditionNote: 'window light', isDefault: false });
    const subject = new RegExp(`^T-2 fails a target · Target visor ${tag}$`);
    // passing: state recorded, nothing sent
    expect((await notifyTargetFailures(a.labId, rev.id)).mailed).toEqual([]);
    // a poor re-run of one capture set pulls the mean to 1.30: fails, one mail to the lead
    await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[0]!, { acr: 1.03 }, later());
    const first = await notifyTargetFailures(a.labId, rev.id);
    expect(first.mailed).toEqual([leadEmail]);
    const mails = await waitForCount(leadEmail, subject, 1);
    expect(mails).toHaveLength(1);
    expect(mails[0]?.text).toMatch(/Ambient contrast ratio at least 1\.4 : 1 \(window light\): mean 1\.30 : 1 over 3 capture sets/);
    expect(mails[0]?.text).toContain(`/projects/${fx.projectId}/revisions/${rev.id}`);
    // still failing after another reading: no second mail
    await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[1]!, { acr: 1.4 }, later());
    expect((await notifyTargetFailures(a.labId, rev.id)).mailed).toEqual([]);
    // passes again, then fails again: a new state change, a new mail
    await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[0]!, { acr: 1.5 }, later());
    expect((await notifyTargetFailures(a.labId, rev.id)).mailed).toEqual([]);
    await insertReading(a.labId, fx.projectId, rev.id, rev.captureSetIds[0]!, { acr: 1.0 }, later());
    expect((await notifyTargetFailures(a.labId, rev.id)).mailed).toEqual([leadEmail]);
    expect(await waitForCount(leadEmail, subject, 2)).toHaveLength(2);
    // another lab's id never triggers anything
    expect(await notifyTargetFailures(b.labId, rev.id)).toEqual({ newlyFailing: [], mailed: [] });
  });
});
