import type { Knex } from 'knex';
import { getDb } from '../index';
import { type Analysis, toAnalysis } from './analyses';
import { recordAudit } from './audit';

/**
 * Analyses a lab may have waiting or running at once; a request beyond answers 429. Room for a lab's
 * burst (the load test uploads 30 capture sets at once) while bounding the queue; fairness between
 * labs comes from the priorities (lib/server/queue/jobs.ts fairPriority), not from this limit.
 */
export const LAB_ANALYSIS_LIMIT = 50;

export type AnalysisRequestOutcome =
  /** a new analysis, the `rank`-th of its lab's waiting ones (1 = next of this lab) */
  | { kind: 'created'; captureSetId: string; analysis: Analysis; rank: number }
  /** the set's analysis already waiting or running, which will measure what the set holds now */
  | { kind: 'coalesced'; captureSetId: string; analysis: Analysis }
  /** refused: the lab has LAB_ANALYSIS_LIMIT analyses in flight */
  | { kind: 'refused'; captureSetId: string };

type Row = Parameters<typeof toAnalysis>[0];

/**
 * The set's analysis that a new request would only repeat: one still waiting (it reads the photos
 * and regions when it starts), or one running that started after the set's last change (photos,
 * regions, pattern or conditions). A run that started before a change is not reused: it measures
 * what the set held then.
 */
async function inFlightFor(trx: Knex.Transaction, labId: string, captureSetId: string): Promise<Analysis | null> {
  const row: Row | undefined = await trx('analyses as a')
    .where({ 'a.lab_id': labId, 'a.capture_set_id': captureSetId })
    .whereIn('a.status', ['queued', 'running'])
    .where((q) =>
      q.where('a.status', 'queued').orWhereRaw(
        `a.started_at >= greatest(
           (SELECT c.updated_at FROM capture_sets c WHERE c.lab_id = a.lab_id AND c.id = a.capture_set_id),
           (SELECT max(p.updated_at) FROM photos p WHERE p.lab_id = a.lab_id AND p.capture_set_id = a.capture_set_id),
           (SELECT max(r.updated_at) FROM regions r WHERE r.lab_id = a.lab_id AND r.capture_set_id = a.capture_set_id))`,
      ),
    )
    .orderBy('a.created_at', 'desc')
    .first('a.*');
  return row ? toAnalysis(row) : null;
}

/**
 * Records analyses for capture sets of one lab, in one transaction under a per-lab advisory lock
 * (so concurrent requests from every web process see each other's rows): a set whose analysis is
 * already waiting or running gets that one back, a new one is recorded while the lab has fewer than
 * `limit` in flight, the rest are refused. Created ones carry their rank among the lab's waiting
 * analyses, which the queue turns into a priority (lib/server/queue/producer.ts).
 */
export async function recordAnalysisRequests(labId: string, userId: string | null, captureSetIds: readonly string[], limit = LAB_ANALYSIS_LIMIT): Promise<AnalysisRequestOutcome[]> {
  return getDb().transaction(async (trx) => {
    await trx.raw('SELECT pg_advisory_xact_lock(hashtextextended(?, 0))', [`veilmeter:analysis-requests:${labId}`]);
    const counts = (await trx('analyses').where({ lab_id: labId }).whereIn('status', ['queued', 'running']).select(trx.raw(`count(*)::int AS in_flight, count(*) FILTER (WHERE status = 'queued')::int AS waiting`)).first()) as { in_flight: number; waiting: number };
    let inFlight = counts.in_flight;
    let waiting = counts.waiting;
    const out: AnalysisRequestOutcome[] = [];
    const seen = new Map<string, AnalysisRequestOutcome>();
    for (const captureSetId of captureSetIds) {
      const again = seen.get(captureSetId);
      if (again) {
        out.push(again.kind === 'created' ? { kind: 'coalesced', captureSetId, analysis: again.analysis } : again);
        continue;
      }
      let outcome: AnalysisRequestOutcome;
      const existing = await inFlightFor(trx, labId, captureSetId);
      if (existing) outcome = { kind: 'coalesced', captureSetId, analysis: existing };
      else if (inFlight >= limit) outcome = { kind: 'refused', captureSetId };
      else {
        const [row] = await trx('analyses').insert({ lab_id: labId, capture_set_id: captureSetId, requested_by: userId, status: 'queued', stage: 'queued' }).returning<Row[]>('*');
        if (!row) throw new Error('insert returned nothing');
        await recordAudit({ labId, userId, action: 'analysis.request', targetType: 'analysis', targetId: row.id, details: { captureSetId } }, trx);
        inFlight++;
        waiting++;
        outcome = { kind: 'created', captureSetId, analysis: toAnalysis(row), rank: waiting };
      }
      seen.set(captureSetId, outcome);
      out.push(outcome);
    }
    return out;
  });
}

/** Seconds until the lab's next slot is likely free: its recent analyses' mean run time, 5 s to 10 min (30 s without history). */
export async function typicalRunSeconds(labId: string): Promise<number> {
  const row = (await getDb()
    .from(getDb()('analyses').where({ lab_id: labId, status: 'done' }).whereNotNull('started_at').whereNotNull('finished_at').orderBy('finished_at', 'desc').limit(20).select('started_at', 'finished_at').as('recent'))
    .select(getDb().raw('avg(extract(epoch FROM finished_at - started_at))::float8 AS s'))
    .first()) as { s: number | null } | undefined;
  const s = row?.s;
  return Math.min(600, Math.max(5, Math.ceil(typeof s === 'number' && Number.isFinite(s) ? s : 30)));
}

/** The rank of a waiting analysis among its lab's waiting ones (oldest first), for the sweeper's re-enqueue. */
export async function waitingRank(labId: string, analysisId: string): Promise<number> {
  const row = (await getDb()('analyses as a')
    .join('analyses as me', (j) => j.on('me.lab_id', 'a.lab_id'))
    .where({ 'me.lab_id': labId, 'me.id': analysisId, 'a.status': 'queued' })
    .where('a.queued_at', '<=', getDb().ref('me.queued_at'))
    .count<{ n: string }[]>('* as n')
    .first()) as { n: string } | undefined;
  return Math.max(1, Number(row?.n ?? 1));
}
