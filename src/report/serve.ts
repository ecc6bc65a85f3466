// `plumbline serve`: build, serve the site on localhost, rebuild when handbook files change.
// A build that fails to load keeps serving the last good site and prints the problems.
import { createReadStream, existsSync, statSync, watch } from 'node:fs';
import { createServer } from 'node:http';
import { extname, join, normalize, resolve } from 'node:path';
import { formatDiagnostics } from '../diagnostics/messages.ts';
import { checkHandbook } from '../pipeline.ts';
import { buildSite } from './site.ts';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
};

export async function serveSite(root: string, outDir: string, port: number, io: { out: (s: string) => void; err: (s: string) => void }): Promise<void> {
  const rebuild = async (): Promise<void> => {
    const outcome = checkHandbook(root);
    if (!outcome.ok) {
      io.err(formatDiagnostics(outcome.diagnostics));
      return;
    }
    const stats = await buildSite(outcome.handbook, outcome.results, outDir);
    io.out(`rebuilt ${stats.pages} pages`);
  };
  await rebuild();
  const server = createServer((req, res) => {
    const urlPath = decodeURIComponent(new URL(req.url ?? '/', 'http://localhost').pathname);
    let file = normalize(join(outDir, urlPath));
    if (!file.startsWith(resolve(outDir))) {
      res.writeHead(403).end();
      return;
    }
    if (existsSync(file) && statSync(file).isDirectory()) file = join(file, 'index.html');
    if (!existsSync(file)) {
      res.writeHead(404, { 'content-type': 'text/plain' }).end('not found');
      return;
    }
    res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' });
    createReadStream(file).pipe(res);
  });
  server.listen(port, '127.0.0.1', () => io.out(`serving ${outDir} at http://127.0.0.1:${port}/ (Ctrl-C to stop)`));
  let timer: NodeJS.Timeout | undefined;
  for (const dir of ['structures', 'rules']) {
    const p = join(root, dir);
    if (!existsSync(p)) continue;
    watch(p, { recursive: true }, () => {
      clearTimeout(timer);
      timer = setTimeout(() => void rebuild().catch((e: Error) => io.err(e.message)), 150);
    });
  }
  for (const f of ['handbook.yaml', 'materials.yaml']) {
    const p = join(root, f);
    if (existsSync(p)) watch(p, () => void rebuild().catch((e: Error) => io.err(e.message)));
  }
  await new Promise(() => undefined);
}
