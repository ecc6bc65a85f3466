// `plumbline serve`: the real command, on loopback, serves the report and rebuilds it when a
// handbook file changes. Bounded: a few requests, stopped at the end.
import { spawn, type ChildProcess } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const ROOT = resolve(import.meta.dirname, '../..');
const PORT = 18000 + (process.pid % 1000);
let child: ChildProcess | undefined;

afterAll(() => {
  child?.kill();
});

async function fetchWhenReady(url: string, until: (body: string) => boolean, tries = 120): Promise<string> {
  for (let i = 0; i < tries; i++) {
    try {
      const res = await fetch(url);
      const body = await res.text();
      if (res.ok && until(body)) return body;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no matching answer from ${url}`);
}

describe('serve', () => {
  it('serves the report on loopback and rebuilds after a rule file changes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-serve-'));
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
    child = spawn(process.execPath, [join(ROOT, 'bin/plumbline.js'), 'serve', '--root', dir, '--port', String(PORT)], { stdio: 'ignore' });
    const home = await fetchWhenReady(`http://127.0.0.1:${PORT}/`, (b) => b.includes('Minimal handbook'));
    expect(home).toContain('test-pillar');
    const rules = join(dir, 'rules', 'rules.yaml');
    writeFileSync(rules, readFileSync(rules, 'utf8').replace('Pillar aspect ratio at most 6', 'Pillar aspect ratio kept at most 6'));
    const page = await fetchWhenReady(`http://127.0.0.1:${PORT}/rules/TP-AR-1/`, (b) => b.includes('kept at most 6'));
    expect(page).toContain('kept at most 6');
    const missing = await fetch(`http://127.0.0.1:${PORT}/no-such-page/`);
    expect(missing.status).toBe(404);
  }, 90_000);
});
