import { getDb } from '../../db/index';
import { checkRevisionTargets, listLeadEmails, recordTargetState } from '../../db/queries/targets';
import { getEnv } from '../env';
import { targetFailedMail } from '../mail/templates';
import { mailConfigured, sendMail } from '../mail/transport';
import { formatLimit, formatMetricValue } from '../format';
import { describeCondition } from './conditions';
import { comparatorWords, variantName, type TargetCheck } from './evaluate';
import { METRICS } from './metrics';

export type NotifyOutcome = { newlyFailing: TargetCheck[]; mailed: string[] };

/**
 * After a reading lands: judges the revision's targets, records each one's state, and mails the
 * lab's leads about the targets that have just turned to failing. A revision that keeps failing
 * sends nothing more; one that passes again and fails later sends again.
 */
export async function notifyTargetFailures(labId: string, revisionId: string): Promise<NotifyOutcome> {
  const rev = await getDb()('revisions as r')
    .join('projects as p', 'p.id', 'r.project_id')
    .where({ 'r.lab_id': labId, 'r.id': revisionId })
    .first<{ project_id: string; project_name: string; label: string } | undefined>('r.project_id', 'p.name as project_name', 'r.label');
  if (!rev) return { newlyFailing: [], mailed: [] };
  const checks = await checkRevisionTargets(labId, rev.project_id, revisionId);
  const newlyFailing: TargetCheck[] = [];
  for (const c of checks) {
    if (c.status === 'no-data') continue;
    const failing = c.status === 'fail';
    const changed = await recordTargetState(labId, c.target.id, revisionId, failing, c.variant ?? '');
    if (changed && failing) newlyFailing.push(c);
  }
  // without a relay (a plain npm start) the failing state shows on the pages and nothing is mailed
  if (newlyFailing.length === 0 || !mailConfigured()) return { newlyFailing, mailed: [] };
  const leads = await listLeadEmails(labId);
  const link = `${getEnv().NEXTAUTH_URL.replace(/\/$/, '')}/projects/${rev.project_id}/revisions/${revisionId}`;
  const failures = newlyFailing.map((c) => ({
    target: `${METRICS[c.target.metric].label} ${comparatorWords(c.target.comparator)} ${formatLimit(c.target.metric, c.target.value)}${c.variant ? `, as ${variantName(c.variant)}` : ''}`,
    condition: [describeCondition(c.target.condition ?? {}), c.target.conditionNote].filter(Boolean).join(' · '),
    mean: formatMetricValue(c.target.metric, c.mean),
    n: c.n,
  }));
  const mailed: string[] = [];
  try {
    for (const to of leads) {
      await sendMail(targetFailedMail(to, { projectName: rev.project_name, revisionLabel: rev.label, failures, link }));
      mailed.push(to);
    }
  } catch (err) {
    // forget the new state so the next reading tries the mail again instead of never sending it
    for (const c of newlyFailing) await getDb()('target_states').where({ lab_id: labId, revision_id: revisionId, target_id: c.target.id, variant: c.variant ?? '' }).delete();
    throw err;
  }
  return { newlyFailing, mailed };
}
