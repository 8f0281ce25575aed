import { checkRevisionTargets, forgetTargetState, getRevisionForMail, listLeadEmails, recordTargetState } from '../../../db/queries/targets';
import { getEnv } from '../../env';
import { targetFailedMail } from '../mail/templates';
import { mailConfigured, sendMail } from '../mail/transport';
import { formatLimit, formatMetricValue } from '../../format';
import { describeCondition } from '../../targets/conditions';
import { comparatorWords, variantName, type TargetCheck } from '../../targets/evaluate';
import { METRICS } from '../../targets/metrics';

export type NotifyOutcome = { newlyFailing: TargetCheck[]; mailed: string[] };

/**
 * After a reading lands: judges the revision's targets, records each one's state, and mails the
 * lab's leads about the targets that have just turned to failing. A revision that keeps failing
 * sends nothing more; one that passes again and fails later sends again.
 */
export async function notifyTargetFailures(labId: string, revisionId: string): Promise<NotifyOutcome> {
  const rev = await getRevisionForMail(labId, revisionId);
  if (!rev) return { newlyFailing: [], mailed: [] };
  const checks = await checkRevisionTargets(labId, rev.projectId, revisionId);
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
  const link = `${getEnv().NEXTAUTH_URL.replace(/\/$/, '')}/projects/${rev.projectId}/revisions/${revisionId}`;
  const failures = newlyFailing.map((c) => ({
    target: `${METRICS[c.target.metric].label} ${comparatorWords(c.target.comparator)} ${formatLimit(c.target.metric, c.target.value)}${c.variant ? `, as ${variantName(c.variant)}` : ''}`,
    condition: [describeCondition(c.target.condition ?? {}), c.target.conditionNote].filter(Boolean).join(' · '),
    mean: formatMetricValue(c.target.metric, c.mean),
    n: c.n,
  }));
  const mailed: string[] = [];
  try {
    for (const to of leads) {
      await sendMail(targetFailedMail(to, { projectName: rev.projectName, revisionLabel: rev.label, failures, link }));
      mailed.push(to);
    }
  } catch (err) {
    // forget the new state so the next reading tries the mail again instead of never sending it
    for (const c of newlyFailing) await forgetTargetState(labId, c.target.id, revisionId, c.variant ?? '');
    throw err;
  }
  return { newlyFailing, mailed };
}
