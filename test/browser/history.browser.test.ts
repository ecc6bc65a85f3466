// The report's history in a real browser: a report built from a repository made here shows the
// revision in every page's footer, a verdict's timeline and margin chart, and the audit page.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';
import { HANDBOOK, TestRepo, arRule, trench } from '../history/repo.ts';
import { CHROMIUM_FLAGS, findChromium } from './chromium.ts';

const ada = { name: 'Ada Example', email: 'ada@example.test' };
const links = `${HANDBOOK}links:\n  report: https://handbooks.example/t/\n  commit: https://code.example/t/commit/{commit}\n`;
let browser: Browser;
let site: string;
let last: string;

beforeAll(async () => {
  const repo = new TestRepo();
  // Aspect ratios depth / cd: 200/25 = 8 (pass ≤ 10), then 260/25 = 10.4 (fail), then 240/25 = 9.6.
  repo.write({ 'handbook.yaml': links, 'rules/geometry.yaml': arRule('10'), 'structures/a.yaml': trench('a', '25 nm', '200 nm') });
  repo.commit('Start', ada, '2026-01-05T09:00:00+00:00');
  repo.write({ 'structures/a.yaml': trench('a', '25 nm', '260 nm') });
  repo.commit('Deepen a', ada, '2026-02-10T09:00:00+00:00');
  repo.write({ 'structures/a.yaml': trench('a', '25 nm', '240 nm') });
  last = repo.commit('Back off a little', ada, '2026-02-11T09:00:00+00:00');
  site = join(mkdtempSync(join(tmpdir(), 'plumbline-history-site-')), 'site');
  const code = await run(['--root', repo.dir, 'build', '--out', site, '--on', '2026-03-01'], { out: () => {}, err: () => {} });
  if (code !== 0) throw new Error(`build exited ${code}`);
  browser = await chromium.launch({ executablePath: (await findChromium()).path, args: CHROMIUM_FLAGS, headless: true });
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe('history in the report', () => {
  it('names the commit it was built from in the footer, linked to the repository', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'index.html')).href);
    const link = page.locator('footer .built a');
    expect(await link.getAttribute('href')).toBe(`https://code.example/t/commit/${last}`);
    expect(await link.textContent()).toBe(last.slice(0, 7));
    await page.close();
  });

  it('shows the verdict timeline newest first, with the input change, and the margin chart', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'rules/TR-AR-1/a/index.html')).href);
    const items = page.locator('section.history ol.timeline > li');
    expect(await items.count()).toBe(3);
    expect(await items.nth(0).locator('.what strong').textContent()).toBe('fixed');
    expect(await items.nth(1).locator('.what strong').textContent()).toBe('started failing');
    expect(await items.nth(1).locator('.causes code').textContent()).toBe('geometry.depth 200 nm → 260 nm at structures/a.yaml:6');
    const chart = page.locator('section.history figure.trend svg');
    expect(await chart.count()).toBe(1);
    const box = await chart.boundingBox();
    expect(box && box.width > 200 && box.height > 80).toBe(true);
    await page.close();
  });

  it('lists every transition on the audit page, by month, newest month first', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(join(site, 'audit/index.html')).href);
    expect(await page.locator('section.audit-month h2').allTextContents()).toEqual(['2026-02', '2026-01']);
    expect(await page.locator('section#m-2026-02 tbody tr').count()).toBe(2);
    await page.close();
  });
});
