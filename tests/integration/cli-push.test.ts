// `veilmeter push`, compiled as it ships (.build/…/cli/veilmeter.mjs, on plain Node), against the
// rig API's route handlers behind a real HTTP server in this process, PostgreSQL, Redis and a real
// worker process: it gets a reading; a connection cut in the middle of an upload and the same
// command run again make no second capture set, photo or analysis; its exit statuses.
import { spawn, type ChildProcess } from 'node:child_process';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Ajv2020 from 'ajv/dist/2020';
import addFormats from 'ajv-formats';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderCapture, type RenderedCapture } from '../fixtures/capture-generator';
import { createTestLab } from '../fixtures/test-lab';
import { removeWorkerBuild, spawnReady, stopWorkers, workerArgs } from '../fixtures/worker-process';
import { isolateRun } from '../fixtures/isolated-run';

const root = join(import.meta.dirname, '..', '..');
const { tmp, prefix } = isolateRun('push');

vi.mock('server-only', () => ({}));
vi.mock('next/headers', () => ({ cookies: async () => ({ get: () => undefined, getAll: () => [], set: () => undefined }) }));

const { getDb, closeDb } = await import('../../db/index');
const { createApiToken, revokeApiToken } = await import('../../db/queries/api-tokens');
const { saveRegionTemplate } = await import('../../db/queries/region-templates');
const { getAnalysisQueue } = await import('../../lib/server/queue/producer');
const { openApiDocument } = await import('../../lib/server/api-v1/openapi');
const { dispatch, startV1Server } = await import('../fixtures/v1-server');

let lab: { labId: string; userId: string; projectId: string; revisionId: string };
let token = '';
let server: Awaited<ReturnType<typeof startV1Server>>;
let cli = '';
let shot: RenderedCapture;
const paths = { on: join(tmp, 'bench-on.jpg'), off: join(tmp, 'bench-off.jpg'), ambient: join(tmp, 'bench-ambient.jpg'), spareOn: join(tmp, 'spare-on.jpg'), spareOff: join(tmp, 'spare-off.jpg'), tinyOn: join(tmp, 'tiny-on.jpg'), oddOff: join(tmp, 'odd-off.jpg') };
const workers: ChildProcess[] = [];
const logs: string[] = [];
// the next upload of this role has its connection cut after its first bytes arrive
let cutUploadOf: string | null = null;
let uploadsSeen = 0;

function push(args: string[], env: Record<string, string> = {}): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [cli, 'push', ...args], { cwd: root, env: { ...process.env, VEILMETER_TOKEN: '', ...env } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

const count = async (table: string, where: Record<string, string>) => Number((await getDb()(table).where(where).count<{ n: string }[]>('id as n'))[0]!.n);

beforeAll(async () => {
  lab = await createTestLab(getDb(), { tag: prefix, name: 'Push lab', project: 'Push visor', revision: 'P1' });
  token = (await createApiToken(lab.labId, lab.userId, 'bench rig', ['read', 'capture:write'])).token;
  shot = await renderCapture({ width: 1600, height: 1200, seed: 2405, screen: { x: 500, y: 360, w: 600, h: 400 }, background: { x: 60, y: 60, w: 300, h: 220 }, displayLevel: 0.2, transmission: 0.35, ghost: null, noise: 0.01, quality: 97 });
  writeFileSync(paths.on, shot.on);
  writeFileSync(paths.off, shot.off);
  writeFileSync(paths.ambient, shot.ambient);
  // other files for the failure cases: a lab keeps each file once, so these must differ from the bench shot
  const spare = await renderCapture({ width: 640, height: 480, seed: 9 });
  writeFileSync(paths.spareOn, spare.on);
  writeFileSync(paths.spareOff, spare.off);
  // on and off swapped: no display light between them, so the analysis fails
  const swapped = await renderCapture({ width: 640, height: 480, seed: 12 });
  writeFileSync(paths.tinyOn, swapped.off);
  writeFileSync(paths.oddOff, swapped.on);
  const t = shot.truth;
  await saveRegionTemplate(lab.labId, lab.userId, { projectId: lab.projectId, name: 'Bench jig', imageWidth: 1600, imageHeight: 1200, regions: [{ kind: 'screen', ...t.screen }, { kind: 'background', ...t.background }] });
  const env = { ...process.env, QUEUE_PREFIX: prefix, STORAGE_DIR: join(tmp, 'storage'), STORAGE_DRIVER: 'local', WORKER_CONCURRENCY: '1' };
  await spawnReady(workerArgs(), { env, what: 'worker', log: logs, track: workers });
  // workerArgs compiled the CLI beside the worker, as scripts/build-worker.mjs ships it
  cli = join(root, '.build', `test-${process.pid}`, 'cli', 'veilmeter.mjs');
  server = await startV1Server((req) => {
    if (!req.url?.includes('/photos?role=')) return;
    uploadsSeen++;
    if (cutUploadOf && req.url.includes(`role=${cutUploadOf}`)) {
      cutUploadOf = null;
      req.once('data', () => req.socket.destroy());
    }
  });
});

afterAll(async () => {
  await server?.close();
  await stopWorkers(workers);
  await getAnalysisQueue().close().catch(() => undefined);
  if (lab) {
    await getDb()('labs').where({ id: lab.labId }).delete();
    await getDb()('users').where({ id: lab.userId }).delete();
  }
  await closeDb();
  rmSync(tmp, { recursive: true, force: true });
  removeWorkerBuild();
});

describe('veilmeter push', () => {
  const args = () => ['--server', server.url, '--revision', lab.revisionId, '--on', paths.on, '--off', paths.off, '--ambient', paths.ambient, '--template', 'Bench jig', '--variant', 'left eye'];

  it('resumes after a connection cut mid-upload without duplicates, and prints the reading', async () => {
    cutUploadOf = 'off';
    const broken = await push(args(), { VEILMETER_TOKEN: token });
    expect(broken.code, broken.stderr).toBe(1);
    expect(broken.stderr).toMatch(/connection .* failed while trying to upload the off photo bench-off\.jpg.*run the same command again/);
    expect(broken.stderr).toMatch(/uploading on .*100%/);
    expect(await count('capture_sets', { lab_id: lab.labId })).toBe(1);
    expect(await count('photos', { lab_id: lab.labId })).toBe(1);

    const done = await push([...args(), '--wait', '--json'], { VEILMETER_TOKEN: token });
    expect(done.code, done.stderr + logs.slice(-10).join('')).toBe(0);
    const answer = JSON.parse(done.stdout) as { captureSetId: string; analysisId: string; status: string; reading: { ambientContrastRatio: number } };
    expect(answer.status).toBe('done');
    // the generator's truth (tests/fixtures/capture-generator.ts), within the engine's 1.5% on a noisy JPEG
    expect(Math.abs(answer.reading.ambientContrastRatio / shot.truth.ambientContrastRatio - 1)).toBeLessThan(0.015);
    // the template's regions were placed on the set and measured
    expect(await getDb()('regions').where({ lab_id: lab.labId, capture_set_id: answer.captureSetId }).orderBy('kind').select('kind', 'source')).toEqual([
      { kind: 'background', source: 'template' },
      { kind: 'screen', source: 'template' },
    ]);

    expect(await count('capture_sets', { lab_id: lab.labId })).toBe(1);
    expect(await count('photos', { lab_id: lab.labId })).toBe(3);
    expect(await count('analyses', { lab_id: lab.labId })).toBe(1);
    const set = await getDb()('capture_sets').where({ lab_id: lab.labId }).first('id', 'label', 'variant');
    expect(set).toMatchObject({ id: answer.captureSetId, label: 'bench-on', variant: 'left eye' });

    // the real reading's answer matches the published document
    const polled = await dispatch(new Request(`http://127.0.0.1/api/v1/analyses/${answer.analysisId}`, { headers: { authorization: `Bearer ${token}` } }));
    const ajv = new Ajv2020({ strict: false });
    addFormats(ajv);
    const doc = openApiDocument() as { components: { schemas: Record<string, object> } };
    expect(ajv.validate(doc.components.schemas.AnalysisAnswer!, await polled.json()), ajv.errorsText()).toBe(true);

    // and once more, all the way through: the same set and analysis, nothing new
    const seen = uploadsSeen;
    const again = await push([...args(), '--wait'], { VEILMETER_TOKEN: token });
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toContain(answer.captureSetId);
    expect(again.stdout).toMatch(/ambient contrast ratio\s+\d/);
    expect(uploadsSeen - seen).toBe(3);
    expect(await count('capture_sets', { lab_id: lab.labId })).toBe(1);
    expect(await count('analyses', { lab_id: lab.labId })).toBe(1);
  });

  it('exits 2 on bad input, 3 when the server refuses, 4 when the analysis fails', async () => {
    const noOff = await push(['--server', server.url, '--token', token, '--revision', lab.revisionId, '--on', paths.on]);
    expect(noOff.code).toBe(2);
    expect(noOff.stderr).toMatch(/--on FILE --off FILE/);
    const missing = await push(['--server', server.url, '--token', token, '--revision', lab.revisionId, '--on', paths.on, '--off', join(tmp, 'nope.jpg')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/cannot read the off photo .*no such file/);
    const noToken = await push(['--server', server.url, '--revision', lab.revisionId, '--on', paths.on, '--off', paths.off]);
    expect(noToken.code).toBe(2);
    expect(noToken.stderr).toMatch(/VEILMETER_TOKEN/);
    const badTemplate = await push(['--server', server.url, '--revision', lab.revisionId, '--on', paths.spareOn, '--off', paths.spareOff, '--template', 'No such jig'], { VEILMETER_TOKEN: token });
    expect(badTemplate.code, badTemplate.stderr).toBe(2);
    expect(badTemplate.stderr).toMatch(/no region template "No such jig" \(it has: Bench jig\)/);

    const revoked = await createApiToken(lab.labId, lab.userId, 'old rig', ['read', 'capture:write']);
    await revokeApiToken(lab.labId, lab.userId, revoked.record.id, false);
    const refused = await push(args(), { VEILMETER_TOKEN: revoked.token });
    expect(refused.code, refused.stderr).toBe(3);
    expect(refused.stderr).toMatch(/refused to create the capture set: 401 This token is unknown or revoked/);
    const unknownRevision = await push(['--server', server.url, '--revision', '00000000-0000-4000-8000-000000000000', '--on', paths.on, '--off', paths.off], { VEILMETER_TOKEN: token });
    expect(unknownRevision.code, unknownRevision.stderr).toBe(3);
    expect(unknownRevision.stderr).toMatch(/404 No such revision/);

    // photos the server stores but the engine cannot measure
    const failing = await push(['--server', server.url, '--revision', lab.revisionId, '--on', paths.tinyOn, '--off', paths.oddOff, '--label', 'mismatched', '--wait'], { VEILMETER_TOKEN: token });
    expect(failing.code, failing.stderr + failing.stdout).toBe(4);
    expect(failing.stderr).toMatch(/the analysis failed: No display light found/);
  });

  it('documents itself in --help', async () => {
    const help = await push(['--help']);
    expect(help.code).toBe(0);
    for (const option of ['--server', '--token', '--revision', '--on', '--off', '--ambient', '--dark', '--template', '--variant', '--wait', '--json', 'VEILMETER_TOKEN', 'Idempotency-Key']) expect(help.stdout).toContain(option);
    expect(help.stdout).toMatch(/3 {2}the server refused/);
    expect(help.stdout).toMatch(/4 {2}the analysis failed/);
  });
});
