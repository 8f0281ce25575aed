// Times the trend route's query path (the project trend query + per-revision statistics) on a
// throwaway project of 200 revisions × 10 readings in the database the environment points at.
// Figures: median and p95 of 30 timed runs after 5 warm-up runs. Target: median < 100 ms.
import { performance } from 'node:perf_hooks';
import { closeDb, getDb } from '../db/index';
import { listTargets } from '../db/queries/targets';
import { getProjectTrend } from '../db/queries/trends';

const REVISIONS = 200;
const PER_REVISION = 10;
const WARMUP = 5;
const RUNS = 30;

async function seed(): Promise<{ labId: string; projectId: string }> {
  const db = getDb();
  const [lab] = await db('labs').insert({ name: `bench-api ${Date.now()}` }).returning<{ id: string }[]>('id');
  const labId = lab!.id;
  const [project] = await db('projects').insert({ lab_id: labId, name: 'bench trend project' }).returning<{ id: string }[]>('id');
  const projectId = project!.id;
  const revs = await db('revisions')
    .insert(Array.from({ length: REVISIONS }, (_, i) => ({ lab_id: labId, project_id: projectId, label: `B-${i + 1}`, position: i + 1, status: 'measured' })))
    .returning<{ id: string }[]>('id');
  const sets = await db('capture_sets')
    .insert(revs.flatMap((r) => Array.from({ length: PER_REVISION }, (_, j) => ({ lab_id: labId, revision_id: r.id, label: `set ${j + 1}`, variant: j % 2 ? 'with polarizer' : 'no polarizer' }))))
    .returning<{ id: string; revision_id: string }[]>(['id', 'revision_id']);
  const analyses = await db('analyses')
    .insert(sets.map((s) => ({ lab_id: labId, capture_set_id: s.id, status: 'done', engine_version: 'bench' })))
    .returning<{ id: string; capture_set_id: string }[]>(['id', 'capture_set_id']);
  const setById = new Map(sets.map((s) => [s.id, s]));
  let k = 0;
  const rows = analyses.map((a) => {
    const s = setById.get(a.capture_set_id)!;
    const x = (k++ % 97) / 97; // invented, deterministic scatter
    return {
      lab_id: labId, analysis_id: a.id, capture_set_id: s.id, revision_id: s.revision_id, project_id: projectId, variant: '', engine_version: 'bench',
      ambient_contrast_ratio: 1.1 + x, michelson: x / 3, uniformity: 0.7 + x / 5, ghost_ratio: 0.01 + x / 100, transmission: 0.3 + x / 10, tint_delta_e00: 1 + x,
      warning_count: 0, result: JSON.stringify({ engineVersion: 'bench', pad: 'x'.repeat(2000) }),
    };
  });
  for (let i = 0; i < rows.length; i += 500) await db('readings').insert(rows.slice(i, i + 500));
  return { labId, projectId };
}

async function main(): Promise<void> {
  const db = getDb();
  const t0 = performance.now();
  const { labId, projectId } = await seed();
  console.log(`seeded ${REVISIONS} revisions × ${PER_REVISION} readings in ${(performance.now() - t0).toFixed(0)} ms`);
  try {
    const once = async () => {
      const s = performance.now();
      const [trend] = await Promise.all([getProjectTrend(labId, projectId), listTargets(labId, projectId)]);
      // what the route sends: the JSON body is part of the cost
      const body = JSON.stringify(trend?.trends);
      return { ms: performance.now() - s, bytes: body.length, points: trend?.readings.length ?? 0 };
    };
    for (let i = 0; i < WARMUP; i++) await once();
    const times: number[] = [];
    let last = { ms: 0, bytes: 0, points: 0 };
    for (let i = 0; i < RUNS; i++) {
      last = await once();
      times.push(last.ms);
    }
    times.sort((x, y) => x - y);
    const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))]!;
    const median = (times[(RUNS - 1) >> 1]! + times[RUNS >> 1]!) / 2;
    console.log(`trend query path: ${RUNS} runs after ${WARMUP} warm-up · ${last.points} readings · ${(last.bytes / 1024).toFixed(0)} KiB JSON`);
    console.log(`  min ${times[0]!.toFixed(1)} ms · median ${median.toFixed(1)} ms · p95 ${at(0.95).toFixed(1)} ms · max ${times[times.length - 1]!.toFixed(1)} ms`);
    console.log(`  target median < 100 ms: ${median < 100 ? 'met' : 'NOT met'}`);
  } finally {
    await db('labs').where({ id: labId }).delete();
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
