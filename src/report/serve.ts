// `plumbline serve`: build, serve the report on loopback, rebuild when handbook files change.
// A build that fails to load keeps serving the last good report and prints the problems.
//
// Only files inside the report's real folder are served: each request path is decoded segment by
// segment (a malformed escape is a 400, an encoded slash or a dot segment too), resolved through
// links, and served only if its real path lies inside the report and is a regular file. Every
// failure is an answer (400, 404, 405), never a crash.
import { createReadStream, realpathSync, statSync, watch, type FSWatcher } from 'node:fs';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { extname, join, resolve } from 'node:path';
import { formatDiagnostics, formatWarnings } from '../diagnostics/messages.ts';
import { isInside } from '../model/folder-source.ts';
import type { Diagnostic } from '../diagnostics/diagnostic.ts';
import type { Handbook } from '../model/types.ts';
import type { Results } from '../checker/evaluate.ts';
import { ensureFolder, guardOutput, writeFailure } from './publish.ts';
import { Refusal } from '../diagnostics/refusal.ts';
import { HANDBOOK_INPUTS } from '../model/source.ts';
import { buildSite } from './site.ts';
import { CONTENT_SECURITY_POLICY } from './policy.ts';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.txt': 'text/plain; charset=utf-8',
};

export type Resolved = { file: string } | { status: 400 | 404 };

/**
 * The file a request path names inside `rootReal` (a real, absolute path), or the status to answer.
 * Pure apart from reading the file system; exported for tests.
 */
export function resolveRequest(rootReal: string, rawUrl: string): Resolved {
  const pathPart = rawUrl.split(/[?#]/, 1)[0] ?? '/';
  if (!pathPart.startsWith('/')) return { status: 400 };
  const segments: string[] = [];
  for (const raw of pathPart.split('/').slice(1)) {
    let seg: string;
    try {
      seg = decodeURIComponent(raw);
    } catch {
      return { status: 400 }; // a malformed escape such as %E0%A4%A
    }
    if (seg.includes('/') || seg.includes('\\') || seg.includes('\0')) return { status: 400 };
    if (seg === '.' || seg === '..') return { status: 400 };
    if (seg.startsWith('.')) return { status: 404 }; // our marker and any dotfile stay private
    segments.push(seg);
  }
  let candidate = join(rootReal, ...segments);
  try {
    let real = realpathSync(candidate);
    if (!isInside(rootReal, real)) return { status: 404 };
    if (statSync(real).isDirectory()) {
      candidate = join(real, 'index.html');
      real = realpathSync(candidate);
      if (!isInside(rootReal, real)) return { status: 404 };
    }
    return statSync(real).isFile() ? { file: real } : { status: 404 };
  } catch {
    return { status: 404 };
  }
}

function answer(res: ServerResponse, status: number, text: string): void {
  res.writeHead(status, { 'content-type': 'text/plain; charset=utf-8', 'x-content-type-options': 'nosniff' }).end(`${text}\n`);
}

export interface Serving {
  port: number;
  close: () => Promise<void>;
}

export interface ServeIo {
  out: (s: string) => void;
  err: (s: string) => void;
}

/** Start listening; rejects with a Refusal when the port cannot be used. */
function listen(server: Server, port: number): Promise<number> {
  return new Promise((res, rej) => {
    const onError = (err: NodeJS.ErrnoException) => {
      server.off('listening', onListening);
      if (err.code === 'EADDRINUSE') rej(new Refusal('port-in-use', { port }));
      else if (err.code === 'EACCES') rej(new Refusal('port-forbidden', { port }));
      else rej(new Refusal('port-unavailable', { port, reason: err.message }));
    };
    const onListening = () => {
      server.off('error', onError);
      const addr = server.address();
      res(typeof addr === 'object' && addr ? addr.port : port);
    };
    server.once('error', onError);
    server.once('listening', onListening);
    server.listen(port, '127.0.0.1');
  });
}

/**
 * Loads and checks the handbook afresh for each rebuild. The caller supplies it (reading the
 * clock for the day waivers are judged on), so the report never reaches back up the pipeline.
 */
export type Recheck = () => { ok: false; diagnostics: Diagnostic[] } | { ok: true; handbook: Handbook; results: Results };

export async function serveSite(root: string, outDir: string, port: number, io: ServeIo, recheck: Recheck): Promise<Serving> {
  const out = resolve(outDir);
  guardOutput(out, root);
  // Rebuilds run one after another; a change during a build queues one more. Whatever one rebuild
  // meets (a refusal, a full disk, our own bug) is printed and the server keeps serving the last
  // good report: a rejected step never stops the chain.
  let chain: Promise<void> = Promise.resolve();
  const once = async (): Promise<void> => {
    const outcome = recheck();
    if (!outcome.ok) {
      io.err(formatDiagnostics(outcome.diagnostics, 'the last good report is still served'));
      return;
    }
    if (outcome.handbook.warnings.length) io.err(formatWarnings(outcome.handbook.warnings));
    const stats = await buildSite(outcome.handbook, outcome.results, out, { command: 'plumbline serve', onWait: () => io.out('waiting for another build of this folder to finish') });
    stats.recovered.forEach((n) => io.out(n));
    io.out(`rebuilt ${stats.pages} pages`);
  };
  const rebuild = (): Promise<void> =>
    (chain = chain.then(once).catch((e: unknown) => {
      const refusal = writeFailure(e);
      io.err(refusal ? `plumbline: ${refusal.message}` : `plumbline: internal error while rebuilding (please report it): ${(e as Error)?.stack ?? String(e)}`);
    }));
  // The server listens first, so a busy port is refused before anything is written; then the
  // folder is made (empty until a build fills it: 404s until then) and the first build runs.
  let rootReal: string | null = null;

  let allowedHosts = new Set<string>();
  const server = createServer((req: IncomingMessage, res: ServerResponse) => {
    // A page elsewhere could point a name it controls at 127.0.0.1 (DNS rebinding) and read the
    // report: answer only requests addressed to this server by its loopback name.
    if (!allowedHosts.has((req.headers.host ?? '').toLowerCase())) return answer(res, 421, 'misdirected request: use http://127.0.0.1 or http://localhost with this port');
    if (req.method !== 'GET' && req.method !== 'HEAD') return answer(res, 405, 'only GET and HEAD');
    if (rootReal === null) return answer(res, 404, 'not found');
    const r = resolveRequest(rootReal, req.url ?? '/');
    if ('status' in r) return answer(res, r.status, r.status === 400 ? 'bad request' : 'not found');
    const stream = createReadStream(r.file);
    stream.once('error', () => {
      // Gone between resolving and reading (a rebuild swapped the folder): a clean 404.
      if (!res.headersSent) answer(res, 404, 'not found');
      else res.destroy();
    });
    stream.once('open', () => {
      res.writeHead(200, {
        'content-type': TYPES[extname(r.file)] ?? 'application/octet-stream',
        'x-content-type-options': 'nosniff',
        'content-security-policy': CONTENT_SECURITY_POLICY,
        'cache-control': 'no-cache',
      });
      if (req.method === 'HEAD') {
        stream.destroy();
        res.end();
      } else stream.pipe(res);
    });
  });
  server.on('clientError', (_err, socket) => socket.destroy());
  const actual = await listen(server, port);
  allowedHosts = new Set([`127.0.0.1:${actual}`, `localhost:${actual}`]);
  try {
    ensureFolder(out);
    rootReal = realpathSync(out);
  } catch (err) {
    server.close();
    throw err;
  }
  await rebuild();
  io.out(`serving ${out} at http://127.0.0.1:${actual}/ (Ctrl-C to stop)`);

  // The handbook folder itself is watched (not recursively: the report lies in it) for its files,
  // which editors often save by renaming a new file over the old, and for structures/ or rules/
  // appearing; those two are watched recursively while they exist.
  const watchers = new Map<string, FSWatcher>();
  let timer: NodeJS.Timeout | undefined;
  const soon = () => {
    clearTimeout(timer);
    timer = setTimeout(() => {
      watchFolders();
      void rebuild();
    }, 150);
  };
  const watchFolders = () => {
    for (const dir of ['structures', 'rules', 'waivers']) {
      if (watchers.has(dir)) continue;
      try {
        const w = watch(join(root, dir), { recursive: true }, soon);
        w.on('error', () => {
          w.close();
          watchers.delete(dir);
        });
        watchers.set(dir, w);
      } catch {
        // absent for now (or the system's watch limit reached)
      }
    }
  };
  const inputs = new Set<string>(HANDBOOK_INPUTS);
  try {
    watchers.set('', watch(root, (_event, name) => {
      if (name === null || inputs.has(String(name))) soon();
    }));
  } catch {
    io.err('plumbline: cannot watch the handbook folder; changes will not rebuild the report');
  }
  watchFolders();
  return {
    port: actual,
    close: async () => {
      clearTimeout(timer);
      watchers.forEach((w) => w.close());
      const closed = new Promise<void>((r) => server.close(() => r()));
      server.closeAllConnections();
      await closed;
      await chain;
    },
  };
}
