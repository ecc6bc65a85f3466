// The report in a real browser: chromium (see ./chromium.ts for which), driven by playwright-core. A reviewer opens the
// matrix, follows a failing cell to its derivation and finds the worst corner there.
import { mkdtempSync, readdirSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkHandbook } from '../../src/pipeline.ts';
import { FolderSource } from '../../src/model/folder-source.ts';
import { buildSite } from '../../src/report/site.ts';
import { CHROMIUM_FLAGS, findChromium } from './chromium.ts';

const ROOT = resolve(import.meta.dirname, '../..');
let browser: Browser;
let site: string;
let hostileSite: string;
let keepOutP110: number | null = null;

function htmlFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((e) => {
    const p = join(dir, e);
    return statSync(p).isDirectory() ? htmlFiles(p) : p.endsWith('.html') ? [p] : [];
  });
}

beforeAll(async () => {
  site = join(mkdtempSync(join(tmpdir(), 'plumbline-browser-')), 'site');
  const outcome = checkHandbook(new FolderSource(ROOT), { on: "2026-12-02", detail: true });
  if (!outcome.ok) throw new Error('demo handbook does not load');
  keepOutP110 = outcome.results.verdicts.find((v) => v.rule === 'TSV-KOZ-P110' && v.structure === 'package-tsv')?.value ?? null;
  await buildSite(outcome.handbook, outcome.results, site);
  // Hostile text: remote and protocol-relative images, raw HTML, long unbroken titles and links.
  hostileSite = join(mkdtempSync(join(tmpdir(), 'plumbline-browser-hostile-')), 'site');
  const hostile = checkHandbook(new FolderSource(join(ROOT, "test/fixtures/ok_hostile")), { on: "2026-12-02" });
  if (!hostile.ok) throw new Error('hostile fixture does not load');
  await buildSite(hostile.handbook, hostile.results, hostileSite);
  browser = await chromium.launch({ executablePath: (await findChromium()).path, args: CHROMIUM_FLAGS });
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe('report in chromium', () => {
  it('follows a failing matrix cell to its derivation and shows the worst corner', async () => {
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(pathToFileURL(join(site, 'matrix', 'index.html')).href);
    await expect(page.locator('h1').textContent()).resolves.toBe('Compliance matrix');

    // Every blocking failure shows as a failing cell; follow the mold-hole taper one.
    const failing = page.locator('td.cell[data-status="fail"]:not(.c-fail-advisory) a[aria-label^="MH-TAPER-1 on storage-node-mold-hole"]');
    await expect(failing.count()).resolves.toBe(1);
    expect(await failing.getAttribute('aria-label')).toMatch(/: fail, margin -/);
    await failing.click();
    await page.waitForURL(/\/rules\/MH-TAPER-1\/storage-node-mold-hole\/index\.html$/);

    await expect(page.locator('h1').innerText()).resolves.toContain('MH-TAPER-1');
    const corner = page.locator('section.worst-corner');
    await expect(corner.isVisible()).resolves.toBe(true);
    const items = await corner.locator('li').allInnerTexts();
    // Bottom-to-top ratio (CD − 2D·cotθ)/CD is lowest at the narrowest top, the deepest hole and
    // the shallowest sidewall angle: worked out by hand from the formula's monotonicity.
    expect(items.join('\n')).toMatch(/geometry\.cd at its low end/);
    expect(items.join('\n')).toMatch(/geometry\.depth at its high end/);
    expect(items.join('\n')).toMatch(/geometry\.sidewall_angle at its low end/);
    // The formula is typeset and the derivation lists its steps.
    await expect(page.locator('ol.steps math').count()).resolves.toBeGreaterThan(0);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('shows a yield verdict with its interval, and ranks what moves a value with what would pass', async () => {
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(pathToFileURL(join(site, 'rules', 'FIN-STAND-Y', 'periphery-fin', 'index.html')).href);
    const y = page.locator('section.yield');
    await expect(y.isVisible()).resolves.toBe(true);
    const facts = await y.locator('dl').innerText();
    expect(facts).toMatch(/Required\s+99\.73 %/);
    expect(facts).toMatch(/Samples\s+\d+ \(\d+ failing; seed 1\)/);
    // The same structure's worst case: every toleranced input drawn in the tornado chart, and
    // each dimensional input with the values that would pass.
    await page.goto(pathToFileURL(join(site, 'rules', 'FIN-STAND-1', 'periphery-fin', 'index.html')).href);
    const levers = page.locator('section.levers');
    await expect(levers.locator('figure.tornado svg').isVisible()).resolves.toBe(true);
    const rows = await levers.locator('tbody tr').allInnerTexts();
    // cd, height, sidewall angle, contact angle are toleranced; the first four rows are theirs.
    expect(rows.slice(0, 4).map((r) => r.split('\t')[0]).sort()).toEqual(['drying.contact_angle', 'geometry.cd', 'geometry.height', 'geometry.sidewall_angle']);
    expect(rows.join('\n')).toMatch(/passes for geometry\.height ≤ [\d.]+ nm \(now 62 nm\)/);
    await expect(page.locator('section.worst-corner .failure-probability').innerText()).resolves.toMatch(/probability of failure [\d.e-]+ %/);
    // The rule maps its process window; the structure page maps every blocking rule at once and
    // names the rule that bounds each edge.
    await expect(page.locator('section.process-window figure.window svg').isVisible()).resolves.toBe(true);
    await page.goto(pathToFileURL(join(site, 'structures', 'periphery-fin', 'index.html')).href);
    const edges = await page.locator('section.process-window ul.window-edges li').allInnerTexts();
    expect(edges).toHaveLength(4);
    expect(edges.join('\n')).toMatch(/geometry\.height ≤ [\d.]+ nm \(now 62 nm\): bounded by FIN-STAND-1/);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('shows the waived cell in the matrix apart from pass and fail, by colour and by mark, and follows it to its waiver', async () => {
    // The demo's W-ISO-PT-1 waives ISO-PT-1 on cell-isolation-trench on 2026-12-02 (its last day is
    // 2027-06-30): one waived cell, which must not read as a pass or a fail without colour either.
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'matrix', 'index.html')).href);
    const waived = page.locator('td.cell[data-status="waived"]');
    await expect(waived.count()).resolves.toBe(1);
    const look = (selector: string) =>
      page.evaluate(`(() => { const td = document.querySelector(${JSON.stringify(selector)}); const a = td.querySelector('a'); const s = getComputedStyle(td); const l = getComputedStyle(a);
        return { background: s.backgroundColor, color: s.color, border: l.borderTopStyle, text: a.textContent, label: a.getAttribute('aria-label') }; })()`) as Promise<{ background: string; color: string; border: string; text: string; label: string }>;
    const w = await look('td.cell[data-status="waived"]');
    const pass = await look('td.cell[data-status="pass"]');
    const fail = await look('td.cell[data-status="fail"]:not(.c-fail-advisory)');
    expect(w.background).not.toBe(pass.background);
    expect(w.background).not.toBe(fail.background);
    expect(w.color).not.toBe(pass.color);
    expect(w.color).not.toBe(fail.color);
    // Without colour: a W before the margin, a dashed frame, and the waiver said in the label.
    expect(w.text).toMatch(/^W /);
    expect(w.border).toBe('dashed');
    expect([pass.border, fail.border]).toEqual(['none', 'none']);
    expect(w.label).toMatch(/^ISO-PT-1 on cell-isolation-trench: waived, .*W-ISO-PT-1 through 2027-06-30$/);
    // The legend names the mark.
    await expect(page.locator('.legend .c-waived').innerText()).resolves.toMatch(/W\s+waived/);

    await waived.locator('a').click();
    await page.waitForURL(/\/rules\/ISO-PT-1\/cell-isolation-trench\/index\.html$/);
    await expect(page.locator('h1 .badge').getAttribute('data-status')).resolves.toBe('waived');
    const box = page.locator('section.waiver-box');
    await expect(box.isVisible()).resolves.toBe(true);
    const facts = await box.locator('dl.waiver-facts').innerText();
    for (const fact of ['Ines Vardaker', 'Tobiah Rensmark', '2027-06-30', '≥ 0.98', 'waivers/isolation.yaml:2:1']) expect(facts).toContain(fact);
    await box.locator('h2 a').click();
    await page.waitForURL(/\/waivers\/W-ISO-PT-1\/index\.html$/);
    await expect(page.locator('h1 .state').innerText()).resolves.toMatch(/active/i);
    await page.close();
  });

  it('draws the failing keep-out verdict’s mobility map with its circle at the deciding radius', async () => {
    // The map spans 1.5 × the keep-out radius each side of the via (when the radius exceeds two via
    // radii), so the drawn circle's diameter is 1/1.5 of the map's side if it is drawn to scale.
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'rules/TSV-KOZ-P110/package-tsv/index.html')).href);
    const map = page.locator('svg.figure', { has: page.locator('[data-keep-out]') });
    await expect(map.count()).resolves.toBe(1);
    const circle = map.locator('[data-keep-out]');
    expect(Number(await circle.getAttribute('data-keep-out')) / (keepOutP110 ?? NaN)).toBeCloseTo(1, 9);
    const frame = await map.locator('rect[fill="none"]').boundingBox();
    const ring = await circle.boundingBox();
    expect((ring?.width ?? 0) / (frame?.width ?? 1)).toBeCloseTo(1 / 1.5, 1);
    // The stress against distance is on the same page.
    await expect(page.locator('svg.figure[aria-label^="Stress in the silicon"]').count()).resolves.toBe(1);
    await page.close();
  });

  it('navigates from the overview to a structure page with its cross-section drawn', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'index.html')).href);
    await page.getByRole('link', { name: 'storage-node', exact: true }).click();
    await page.waitForURL(/\/structures\/storage-node\/index\.html$/);
    const box = await page.locator('svg.section').boundingBox();
    expect(box?.width ?? 0).toBeGreaterThan(200);
    await page.close();
  });

  it('flags on the structure page a computed value outside its model’s range, though no rule reads it', async () => {
    // The demo via's p-channel mobility shift along ⟨110⟩ at its edge is far beyond the 20 % of the
    // linear piezoresistance model; no rule limits that shift, so only the structure page says so.
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'structures/package-tsv/index.html')).href);
    const row = page.locator('table.plain tr', { has: page.locator('code', { hasText: /^thermomech\.mobility_shift_p110$/ }) });
    await expect(row.count()).resolves.toBe(1);
    const flag = row.locator('a.flag');
    await expect(flag.count()).resolves.toBe(1);
    await flag.click();
    // The mark leads to the list of reasons, which names the quantity it affects.
    const reasons = page.locator('#outside-validity');
    await expect(reasons.isVisible()).resolves.toBe(true);
    const item = reasons.locator('li', { has: page.locator('code', { hasText: /^thermomech\.mobility_shift_p110$/ }) });
    await expect(item.count()).resolves.toBe(1);
    // A quantity inside its range carries no mark.
    const plain = page.locator('table.plain tr', { has: page.locator('code', { hasText: /^geometry\.aspect_ratio$/ }) });
    await expect(plain.locator('a.flag').count()).resolves.toBe(0);
    await page.close();
  });

  it('loads nothing from outside the report and is never wider than a 1280 px window, on every page', async () => {
    // Markdown images that point out of the report and protocol-relative ones were requests to
    // outside hosts; long unbroken titles and links widened every page (regressions).
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    const outside: string[] = [];
    const refused: string[] = [];
    const wide: string[] = [];
    const unstyled: string[] = [];
    for (const [dir, files] of [[site, htmlFiles(site)], [hostileSite, htmlFiles(hostileSite)]] as const) {
      const inside = pathToFileURL(dir).href + '/';
      page.removeAllListeners('request');
      page.removeAllListeners('console');
      page.on('request', (r) => {
        if (!r.url().startsWith(inside)) outside.push(`${r.url()} (from ${page.url()})`);
      });
      page.on('console', (m) => {
        if (/Refused to|Content Security Policy/i.test(m.text())) refused.push(`${page.url()}: ${m.text()}`);
      });
      for (const file of files) {
        await page.goto(pathToFileURL(file).href);
        // Evaluated in the page (as text: the project's types have no DOM).
        const { scroll, masthead } = (await page.evaluate(
          `({ scroll: document.documentElement.scrollWidth, masthead: getComputedStyle(document.querySelector('.masthead')).backgroundColor })`,
        )) as { scroll: number; masthead: string };
        if (scroll > 1280) wide.push(`${file.slice(dir.length)}: ${scroll} px`);
        // The report's own stylesheet loads under its content security policy (#1d2733).
        if (masthead !== 'rgb(29, 39, 51)') unstyled.push(file.slice(dir.length));
      }
    }
    expect(outside).toEqual([]);
    expect(refused).toEqual([]);
    expect(wide).toEqual([]);
    expect(unstyled).toEqual([]);
    await page.close();
  }, 180_000);

  it('says where a remote image was left out, and runs no script from handbook text', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(hostileSite, 'index.html')).href);
    const notes = await page.locator('.blocked-image').allInnerTexts();
    expect(notes.join('\n')).toContain('https://images.example.invalid/pixel.png');
    expect(notes.join('\n')).toContain('//images.example.invalid/p.png');
    expect(notes.join('\n')).toContain('/etc/passwd');
    // Three images leave the report; the svg data: address is refused by markdown-it itself and stays text.
    expect(notes).toHaveLength(3);
    await page.goto(pathToFileURL(join(hostileSite, 'structures', 'h'.repeat(64), 'index.html')).href);
    expect(await page.evaluate('typeof window.__pwned')).toBe('undefined');
    await page.close();
  });

  it("enforces the pages' content security policy: an image from outside is blocked even if one got in", async () => {
    // Second line of defence behind the markdown renderer: put a remote image into a page by hand.
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'index.html')).href);
    const blocked = new Promise<string>((res) => {
      page.on('requestfailed', (r) => res(r.failure()?.errorText ?? ''));
      page.on('console', (m) => {
        if (/Content Security Policy/i.test(m.text())) res('csp');
      });
      setTimeout(() => res('not blocked'), 5000);
    });
    await page.evaluate(`(() => { const i = new Image(); i.src = 'https://images.example.invalid/probe.png'; document.body.append(i); })()`);
    expect(await blocked).toBe('csp');
    await page.close();
  });
});
