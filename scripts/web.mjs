// The production web server: WEB_PROCESSES copies of the built Next.js app (default: one per core,
// at most 4) sharing one port through node:cluster. Each copy is what `next start` serves; several
// of them use every core for reads that one Node.js process would queue behind each other.
// Usage: node scripts/web.mjs -p PORT [-H HOST]. SIGTERM or SIGINT stops every copy.
import cluster from 'node:cluster';
import { createServer } from 'node:http';
import { availableParallelism } from 'node:os';
import compression from 'compression';
import next from 'next';

// the header names of lib/server/cache/read-cache.ts (PRECOMPRESSED_OK, ENCODING_HEADER, LENGTH_HEADER)
const PRECOMPRESSED_OK = 'x-veilmeter-precompressed';
const ENCODING = 'x-veilmeter-encoding';
const LENGTH = 'x-veilmeter-length';
// lib/security/client-ip.ts PEER_HEADER: the socket's address, which a client cannot choose
const PEER = 'x-veilmeter-peer';

function option(flag, fallback) {
  const i = process.argv.indexOf(flag);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}
const port = Number(option('-p', process.env.PORT ?? '3000'));
const hostname = option('-H', process.env.HOST ?? '127.0.0.1');
const wanted = Number(process.env.WEB_PROCESSES ?? Math.min(4, availableParallelism()));
const copies = Number.isInteger(wanted) && wanted >= 1 && wanted <= 64 ? wanted : 1;
if (!Number.isInteger(port) || port < 1 || port > 65535) {
  console.error(`[web] the port must be a whole number from 1 to 65535, not "${option('-p', '')}"`);
  process.exit(2);
}

if (cluster.isPrimary && copies > 1) {
  let stopping = false;
  const fork = () => cluster.fork();
  for (let i = 0; i < copies; i++) fork();
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) return;
    // a copy that died is replaced; the others go on answering meanwhile
    console.error(`[web] process ${worker.process.pid} exited (${signal ?? code}); starting another`);
    setTimeout(fork, 500);
  });
  const stop = () => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), 5000).unref();
    cluster.on('exit', () => {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
    });
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
  console.log(`[web] ${copies} processes on http://${hostname}:${port}`);
} else {
  const app = next({ dev: false, hostname, port, dir: process.cwd() });
  const handle = app.getRequestHandler();
  await app.prepare();
  // gzip pages and their assets for clients that take it, unless the answer is compressed already;
  // below 8 KB a fresh zlib stream per answer costs the server more than the bytes it saves on a
  // lab network. API answers are left alone: Next.js streams them without a length, so the
  // threshold cannot tell a small one, and the large reads come gzipped from the read cache.
  const compress = compression({ threshold: 8192, filter: (req, res) => !(req.url ?? '').startsWith('/api/') && compression.filter(req, res) });
  const server = createServer((req, res) => {
    // answers the read cache keeps gzipped come back marked with ENCODING (Next.js drops a
    // handler's own Content-Encoding); only requests forwarded from here may be answered so
    req.headers[PRECOMPRESSED_OK] = '1';
    // replaces any header of that name the client sent
    req.headers[PEER] = req.socket.remoteAddress ?? '';
    compress(req, res, () => {
      const writeHead = res.writeHead;
      res.writeHead = function (...args) {
        const encoding = res.getHeader(ENCODING);
        if (encoding) {
          res.removeHeader(ENCODING);
          res.setHeader('content-encoding', encoding);
        }
        const length = res.getHeader(LENGTH);
        if (length !== undefined) {
          res.removeHeader(LENGTH);
          // a length is only true of the bytes as sent: not when compressing here, and not for HEAD
          if (!res.getHeader('transfer-encoding') && req.method !== 'HEAD') res.setHeader('content-length', length);
        }
        return writeHead.apply(this, args);
      };
      return handle(req, res).catch((e) => {
      console.error('[web]', e instanceof Error ? e.message : String(e));
      if (!res.headersSent) {
        res.statusCode = 500;
        res.setHeader('content-type', 'application/json');
        res.end(JSON.stringify({ error: { code: 'internal', message: 'Something went wrong on our side' } }));
      } else res.end();
      });
    });
  });
  server.keepAliveTimeout = 65_000;
  server.listen(port, hostname, () => {
    if (copies === 1) console.log(`[web] ready on http://${hostname}:${port}`);
  });
  const stop = () => {
    server.close(() => process.exit(0));
    setTimeout(() => process.exit(0), 3000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}
