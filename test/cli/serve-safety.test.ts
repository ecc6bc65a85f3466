// `serve` gives out only files inside the report, and every bad request is an answer, never a
// crash. Regression tests for the hostile-input review: an encoded "../" reached a sibling folder
// whose name starts like the report's (the containment check lacked a separator), one malformed
// escape stopped the server, and a bad or busy --port exited 3 with a stack trace.
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { createServer, request } from 'node:http';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';
import { serveSite, type Serving } from '../../src/report/serve.ts';
import { checkHandbook } from '../../src/pipeline.ts';
import { FolderSource } from '../../src/model/folder-source.ts';

/** What the serve command hands the server: the handbook checked afresh, on a fixed day. */
const recheckOf = (root: string) => () => checkHandbook(new FolderSource(root), { on: '2026-12-02' });

const ROOT = resolve(import.meta.dirname, '../..');
let serving: Serving;
let base: string;
let hb: string;

/** A raw request: fetch would normalise "../" away before sending it. */
function raw(path: string, method = 'GET', headers: Record<string, string> = {}): Promise<number> {
  return new Promise((res, rej) => {
    const r = request({ host: '127.0.0.1', port: serving.port, path, method, headers }, (resp) => {
      resp.resume();
      resp.on('end', () => res(resp.statusCode ?? 0));
    });
    r.on('error', rej);
    r.end();
  });
}

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-serve-safety-'));
  hb = join(dir, 'hb');
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), hb, { recursive: true });
  // A secret beside the report, in a folder whose name starts with the report's own.
  mkdirSync(join(hb, 'site-secret'));
  writeFileSync(join(hb, 'site-secret', 'secret.txt'), 'secret');
  writeFileSync(join(dir, 'outside.txt'), 'outside');
  serving = await serveSite(hb, join(hb, 'site'), 0, { out: () => undefined, err: () => undefined }, recheckOf(hb));
  base = `http://127.0.0.1:${serving.port}`;
  // Links planted inside the report that point out of it: to a file beside the handbook, and into
  // the sibling folder whose name starts like the report's (a prefix check would let it through).
  symlinkSync(join(dir, 'outside.txt'), join(hb, 'site', 'leak.txt'));
  symlinkSync(join(hb, 'site-secret', 'secret.txt'), join(hb, 'site', 'sibling.txt'));
}, 120_000);

afterAll(async () => {
  await serving?.close();
});

describe('serve gives out files outside the site (regression)', () => {
  it('answers an encoded ../ into a sibling folder with 400, not the file', async () => {
    const res = await fetch(`${base}/..%2fsite-secret/secret.txt`);
    expect(res.status).toBe(400);
    expect(await res.text()).not.toContain('secret');
  });

  it.each(['/../site-secret/secret.txt', '/assets/../../site-secret/secret.txt', '/./index.html', '/%2e%2e/site-secret/secret.txt', '/a%5c..%5c..%5csite-secret%5csecret.txt', '/index.html%00.txt'])('answers the raw path %s with 400', async (path) => {
    expect(await raw(path)).toBe(400);
  });

  it('does not follow a link inside the report to a file outside it', async () => {
    expect((await fetch(`${base}/leak.txt`)).status).toBe(404);
    expect((await fetch(`${base}/sibling.txt`)).status).toBe(404);
  });

  it('answers only requests addressed to it by its loopback name (no DNS rebinding)', async () => {
    expect(await raw('/', 'GET', { host: 'rebound.example.invalid' })).toBe(421);
    expect(await raw('/', 'GET', { host: `localhost:${serving.port}` })).toBe(200);
  });

  it("keeps the report's marker and other dotfiles private", async () => {
    expect((await fetch(`${base}/.plumbline-report`)).status).toBe(404);
  });

  it('answers only GET and HEAD', async () => {
    expect(await raw('/', 'POST')).toBe(405);
    expect(await raw('/', 'HEAD')).toBe(200);
  });
});

describe('one malformed escape stops the server (regression)', () => {
  it.each(['/%E0%A4%A', '/..%c0%af..', '/%', '/%zz', '/%ED%A0%80'])('answers %s with 400 and keeps serving', async (path) => {
    expect(await raw(path)).toBe(400);
    expect((await fetch(`${base}/`)).status).toBe(200);
  });

  it('survives a burst of good and bad requests', async () => {
    const paths = Array.from({ length: 200 }, (_, i) => ['/', '/%E0%A4%A', '/rules/', '/nope/', '/..%2f..%2fetc%2fpasswd'][i % 5]!);
    const codes = await Promise.all(paths.map((p) => raw(p)));
    expect(new Set(codes)).toEqual(new Set([200, 400, 404]));
    expect((await fetch(`${base}/`)).status).toBe(200);
  });
});

describe('an invalid or busy --port exits 3 with a stack trace (regression)', () => {
  async function cli(...argv: string[]): Promise<{ code: number; err: string }> {
    const err: string[] = [];
    const code = await run(argv, { out: () => undefined, err: (s) => err.push(s) });
    return { code, err: err.join('\n') };
  }

  it.each(['abc', '70000', '-1', '80.5', ''])('refuses --port %j with exit 2 and no stack trace', async (port) => {
    const r = await cli('serve', '--root', hb, '--port', port);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/port/);
    expect(r.err).not.toMatch(/\n\s+at /);
  });

  it('refuses a busy port with exit 2, naming it', async () => {
    const blocker = createServer();
    await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
    const port = (blocker.address() as { port: number }).port;
    try {
      const r = await cli('serve', '--root', hb, '--out', join(hb, 'site2'), '--port', String(port));
      expect(r.code).toBe(2);
      expect(r.err).toContain(`port ${port} is already in use`);
      expect(r.err).not.toMatch(/\n\s+at /);
      // Refused before anything was written: no report was built (it used to build one first).
      expect(existsSync(join(hb, 'site2'))).toBe(false);
    } finally {
      blocker.close();
    }
  }, 60_000);
});

describe('serve on a handbook that does not load yet', () => {
  it('keeps running with nothing to serve, then serves the report once the handbook is fixed', async () => {
    const dir = join(mkdtempSync(join(tmpdir(), 'plumbline-serve-broken-')), 'hb');
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
    const file = join(dir, 'structures', 'test-pillar.yaml');
    const good = readFileSync(file, 'utf8');
    writeFileSync(file, good.replace('kind: pillar', 'kind: pilar'));
    const errors: string[] = [];
    const s = await serveSite(dir, join(dir, 'site'), 0, { out: () => undefined, err: (e) => errors.push(e) }, recheckOf(dir));
    try {
      expect(errors.join('\n')).toContain('unknown structure kind');
      expect((await fetch(`http://127.0.0.1:${s.port}/`)).status).toBe(404);
      writeFileSync(file, good);
      let status = 0;
      for (let i = 0; i < 80 && status !== 200; i++) {
        await new Promise((r) => setTimeout(r, 250));
        status = (await fetch(`http://127.0.0.1:${s.port}/`)).status;
      }
      expect(status).toBe(200);
    } finally {
      await s.close();
    }
  }, 60_000);
});
