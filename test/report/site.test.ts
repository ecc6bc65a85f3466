// The published site: every page the design promises exists, every internal link resolves, and an
// invalid handbook leaves an earlier site untouched. Builds the demo handbook once.
import { mkdtempSync, readFileSync, readdirSync, statSync, writeFileSync, existsSync, cpSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';
import { checkHandbook } from '../../src/pipeline.ts';
import { FolderSource } from '../../src/model/folder-source.ts';
import { buildSite } from '../../src/report/site.ts';
import { ENGINES } from '../../src/engines/index.ts';

const ROOT = resolve(import.meta.dirname, '../..');
let out: string;

function htmlFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((e) => {
    const p = join(dir, e);
    return statSync(p).isDirectory() ? htmlFiles(p) : p.endsWith('.html') ? [p] : [];
  });
}

beforeAll(async () => {
  out = join(mkdtempSync(join(tmpdir(), 'plumbline-site-')), 'site');
  const outcome = checkHandbook(new FolderSource(ROOT), { on: "2026-12-02" });
  if (!outcome.ok) throw new Error('demo handbook does not load');
  await buildSite(outcome.handbook, outcome.results, out);
}, 120_000);

describe('demo site', () => {
  it('has a page per rule, per structure and per in-scope verdict, at the stable URLs', () => {
    const outcome = checkHandbook(new FolderSource(ROOT), { on: "2026-12-02" });
    if (!outcome.ok) throw new Error('unreachable');
    for (const r of outcome.handbook.rules) expect(existsSync(join(out, 'rules', r.id, 'index.html')), r.id).toBe(true);
    for (const s of outcome.handbook.structures) expect(existsSync(join(out, 'structures', s.id, 'index.html')), s.id).toBe(true);
    // The brief's example verdict URL: /rules/<RULE>/<structure>/
    expect(existsSync(join(out, 'rules', 'SN-AR-1', 'storage-node', 'index.html'))).toBe(true);
    // A page per waiver, to link from a change request: /waivers/<id>/ (the demo has one).
    expect(outcome.handbook.waivers.map((w) => w.id)).toEqual(['W-ISO-PT-1']);
    for (const w of outcome.handbook.waivers) expect(existsSync(join(out, 'waivers', w.id, 'index.html')), w.id).toBe(true);
    for (const p of ['index.html', 'matrix/index.html', 'rules/index.html', 'structures/index.html', 'waivers/index.html', 'methods/index.html', 'methods/geometry/index.html', 'schemas/index.html']) {
      expect(existsSync(join(out, p)), p).toBe(true);
    }
  });

  it('resolves every internal link and anchor', () => {
    const files = htmlFiles(out);
    const broken: string[] = [];
    for (const file of files) {
      const html = readFileSync(file, 'utf8');
      for (const m of html.matchAll(/href="([^"]+)"/g)) {
        const href = m[1]!;
        if (/^(https?:|mailto:)/.test(href)) continue;
        const [path, hash] = href.split('#');
        const target = path ? resolve(dirname(file), path) : file;
        if (!existsSync(target)) {
          broken.push(`${file.slice(out.length)} → ${href}`);
          continue;
        }
        if (hash && target.endsWith('.html') && !readFileSync(target, 'utf8').includes(`id="${hash}"`)) broken.push(`${file.slice(out.length)} → #${hash}`);
      }
    }
    expect(broken).toEqual([]);
  });

  it('puts the caution on every page', () => {
    for (const file of htmlFiles(out)) {
      const html = readFileSync(file, 'utf8');
      expect(html, file).toContain('confirm them on silicon');
      expect(html, file).toContain('safety rules and local codes');
    }
  });

  it('publishes the JSON Schemas as valid JSON', () => {
    for (const f of ['structure.schema.json', 'rule.schema.json', 'waiver.schema.json', 'materials.schema.json', 'handbook.schema.json']) {
      const schema = JSON.parse(readFileSync(join(out, 'schemas', f), 'utf8')) as { $schema?: string };
      expect(schema.$schema).toMatch(/json-schema\.org/);
    }
  });

  it('typesets formulas as MathML and draws charts and sections as SVG', () => {
    const verdict = readFileSync(join(out, 'rules', 'MH-TAPER-1', 'storage-node-mold-hole', 'index.html'), 'utf8');
    expect(verdict).toContain('<math');
    const rule = readFileSync(join(out, 'rules', 'SN-AR-1', 'index.html'), 'utf8');
    expect(rule).toMatch(/<svg[^>]*role="img"/);
    const structure = readFileSync(join(out, 'structures', 'storage-node', 'index.html'), 'utf8');
    expect(structure).toContain('class="section"');
    // The fill march hands its profile history to the report, drawn beside the step.
    const fill = readFileSync(join(out, 'rules', 'ISO-FILL-1', 'periphery-isolation-trench', 'index.html'), 'utf8');
    expect(fill).toMatch(/<svg class="figure"[^>]*aria-label="Fill profile/);
    expect(fill).toContain('void ');
  });

  it('shows at least one formula for every quantity on its methods page', () => {
    // Each quantity section of an engine page holds its formulas in formula blocks (its symbol in
    // the heading is MathML too, so the block is what counts).
    const missing: string[] = [];
    for (const engine of ENGINES) {
      const page = readFileSync(join(out, 'methods', engine.id, 'index.html'), 'utf8');
      for (const q of engine.quantities) {
        const start = page.indexOf(`id="${q.name.replace('.', '-')}"`);
        const section = page.slice(start, page.indexOf('</section>', start));
        if (start < 0 || !/class="formula"><span class="katex"><math/.test(section)) missing.push(q.name);
      }
    }
    expect(missing).toEqual([]);
  });

  it('shows the waived verdict with its waiver: who, until when, where written and the limit it must still meet', () => {
    // W-ISO-PT-1 (waivers/isolation.yaml, its mapping at line 2 after a comment): ISO-PT-1 on
    // cell-isolation-trench, last day 2027-06-30, still at least 0.98; judged on 2026-12-02.
    const page = readFileSync(join(out, 'rules', 'ISO-PT-1', 'cell-isolation-trench', 'index.html'), 'utf8');
    expect(page).toContain('data-status="waived"');
    for (const fact of ['W-ISO-PT-1', 'Ines Vardaker', 'Tobiah Rensmark', '2027-06-30', 'waivers/isolation.yaml:2:1', '≥ 0.98', 'mask revision C']) expect(page, fact).toContain(fact);
    const waiver = readFileSync(join(out, 'waivers', 'W-ISO-PT-1', 'index.html'), 'utf8');
    expect(waiver).toContain('state-active');
    expect(waiver).toContain('judged on 2026-12-02');
    // The overview counts it apart from the failures.
    const overview = readFileSync(join(out, 'index.html'), 'utf8');
    expect(overview).toMatch(/<div class="tile tile-waived"><span class="n">1<\/span> waived/);
    expect(overview).toMatch(/<span class="n">10<\/span> blocking failures/);
  });

  it('renders rationale markdown with raw HTML switched off', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-md-'));
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
    const rulesFile = join(dir, 'rules', 'rules.yaml');
    writeFileSync(rulesFile, readFileSync(rulesFile, 'utf8').replace(/rationale: .*/, 'rationale: "**bold** <script>alert(1)</script>"'));
    const outcome = checkHandbook(new FolderSource(dir), { on: "2026-12-02" });
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.diagnostics));
    const site = join(dir, 'site');
    await buildSite(outcome.handbook, outcome.results, site);
    const id = outcome.handbook.rules[0]!.id;
    const html = readFileSync(join(site, 'rules', id, 'index.html'), 'utf8');
    expect(html).toContain('<strong>bold</strong>');
    expect(html).not.toContain('<script>alert(1)</script>');
    expect(html).toContain('&lt;script&gt;');
  }, 60_000);
});

describe('build is atomic', () => {
  it('an invalid handbook exits 2 and leaves the previous site untouched', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-atomic-'));
    const site = join(dir, 'site');
    const io = { out: () => undefined, err: () => undefined };
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), join(dir, 'hb'), { recursive: true });
    expect(await run(['build', '--root', join(dir, 'hb'), '--out', site], io)).toBe(0);
    const before = readFileSync(join(site, 'index.html'), 'utf8');
    const marker = join(site, 'marker.txt');
    writeFileSync(marker, 'earlier build');
    const code = await run(['build', '--root', join(ROOT, 'test/fixtures/invalid_wrong_dimension'), '--out', site], io);
    expect(code).toBe(2);
    expect(readFileSync(join(site, 'index.html'), 'utf8')).toBe(before);
    expect(readFileSync(marker, 'utf8')).toBe('earlier build');
  }, 60_000);
});
