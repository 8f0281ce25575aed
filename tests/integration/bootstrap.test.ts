// The bootstrap's shell helpers (scripts/lib.sh) as npm start and npm test use them, from a checkout
// in a private folder: a `mktemp -d` folder or /root is mode 0700, so the postgres user cannot enter
// it. The cluster and the password file initdb reads must then go where postgres can reach them,
// and nothing may be left behind. Takes a few seconds (one small throwaway cluster).
import { spawnSync } from 'node:child_process';
import { chmodSync, cpSync, existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { freePort } from '../fixtures/free-port';

const root = join(import.meta.dirname, '..', '..');
const home = mkdtempSync(join(tmpdir(), 'vm-private-'));
chmodSync(home, 0o700);
// a copy of the scripts is all the bootstrap's database part reads
const clone = join(home, 'p');
cpSync(join(root, 'scripts'), join(clone, 'scripts'), { recursive: true });

function bash(script: string, env: Record<string, string> = {}) {
  const r = spawnSync('bash', ['-c', script], { cwd: clone, env: { ...process.env, ...env }, encoding: 'utf8', timeout: 90_000 });
  return { status: r.status, out: `${r.stdout}${r.stderr}` };
}

afterAll(() => {
  // if a check failed half-way: stop and remove what it made
  bash('. scripts/lib.sh; find_pg_bin; pg_stop "$DATA"; pg_remove "$DATA"', { DATA: join(clone, '.test-data', 'run') });
  rmSync(home, { recursive: true, force: true });
});

describe('bootstrap from a private folder', () => {
  it('sourcing scripts/lib.sh leaves the caller’s shell options as they were', () => {
    const r = bash('before="$-:$(shopt -po pipefail)"; . scripts/lib.sh; after="$-:$(shopt -po pipefail)"; echo "$before|$after"');
    expect(r.status).toBe(0);
    const [before, after] = r.out.trim().split('|');
    expect(after).toBe(before);
  });

  it('initialises, starts, reaches, stops and removes a cluster, leaving no password file', async () => {
    const data = join(clone, '.test-data', 'run');
    const port = String(await freePort());
    const password = `pw${Math.random().toString(36).slice(2, 12)}`;
    const r = bash(
      [
        'set -euo pipefail',
        '. scripts/lib.sh',
        'find_pg_bin',
        'pg_start "$DATA" "$PORT" throwaway',
        'echo "cluster=$(readlink -f "$DATA/pg")"',
        'echo "answer=$(psql -h 127.0.0.1 -p "$PORT" -U veilmeter -d postgres -tAc "select 40 + 2")"',
        'ls -A "$(dirname "$(readlink -f "$DATA/pg")")" "$DATA" | sed "s/^/left=/"',
        'pg_stop "$DATA"',
        'pg_remove "$DATA"',
      ].join('\n'),
      { DATA: data, PORT: port, PGPASSWORD: password },
    );
    expect(r.status, r.out).toBe(0);
    const cluster = /cluster=(.*)/.exec(r.out)?.[1] ?? '';
    // not inside the private folder: postgres could not enter it
    expect(cluster).toMatch(/^\/var\/lib\/veilmeter\/[0-9a-f]{12}\/pg$/);
    expect(r.out).toContain('answer=42');
    // the password file was removed once initdb had read it
    expect(r.out).not.toMatch(/pgpass/);
    expect(existsSync(join(cluster, '..'))).toBe(false);
    expect(existsSync(join(data, 'pg'))).toBe(false);
    expect(readdirSync(data)).not.toContain('.pgpass-init');
    // the private folder stayed private
    expect(statSync(home).mode & 0o777).toBe(0o700);
  }, 90_000);

  // start.sh prints "running" only after wait_healthy returns
  describe('waiting for the web app’s health check', () => {
    const serve = (status: number) => `require('node:http').createServer((q, r) => { r.writeHead(q.url === '/api/health' ? ${status} : 404); r.end('{"ok":${status === 200}}'); }).listen(Number(process.env.PORT), '127.0.0.1')`;
    const wait = async (program: string, seconds: number) => {
      const port = String(await freePort());
      const started = Date.now();
      const r = bash(
        [
          '. scripts/lib.sh',
          'node -e "$PROGRAM" > "$HOME_DIR/web.log" 2>&1 & echo $! > "$HOME_DIR/web.pid"',
          'trap \'kill "$(cat "$HOME_DIR/web.pid")" 2>/dev/null\' EXIT',
          `wait_healthy "$PORT" "$HOME_DIR/web.pid" "$HOME_DIR/web.log" ${seconds}`,
          'echo running',
        ].join('\n'),
        { PROGRAM: program, PORT: port, HOME_DIR: home },
      );
      return { ...r, ms: Date.now() - started };
    };

    it('goes on once /api/health answers 200', async () => {
      const r = await wait(serve(200), 20);
      expect(r.status, r.out).toBe(0);
      expect(r.out).toContain('running');
    });

    it('stops with the reason when the app answers 503 until the time runs out', async () => {
      const r = await wait(serve(503), 2);
      expect(r.status).toBe(1);
      expect(r.out).not.toContain('running');
      expect(r.out).toMatch(/did not answer its health check on http:\/\/127\.0\.0\.1:\d+\/api\/health within 2 s/);
      expect(r.out).toContain('{"ok":false}');
    });

    it('stops at once when the app exits', async () => {
      const r = await wait("console.error('cannot read the build'); process.exit(3)", 20);
      expect(r.status).toBe(1);
      expect(r.out).not.toContain('running');
      expect(r.out).toMatch(/exited before answering its health check/);
      expect(r.out).toContain('cannot read the build');
      expect(r.ms).toBeLessThan(10_000);
    });
  });
});
