// Render the report with Eleventy into a fresh folder beside the target, then swap it in (publish.ts
// guards, locks and recovers). A failed build leaves the previous site as it was.
import { readdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import Eleventy from '@11ty/eleventy';
import type { Results } from '../checker/evaluate.ts';
import type { Handbook } from '../model/types.ts';
import { assembleReport, type ReportData, type ReportExtras } from './assemble.ts';
import { guardOutput, publish, type LockOptions } from './publish.ts';

const PACKAGE_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const TEMPLATES_DIR = join(PACKAGE_ROOT, 'templates');
const CONFIG_PATH = join(PACKAGE_ROOT, 'eleventy.config.js');

function countHtml(dir: string): number {
  let n = 0;
  for (const entry of readdirSync(dir)) {
    const p = join(dir, entry);
    if (statSync(p).isDirectory()) n += countHtml(p);
    else if (entry.endsWith('.html')) n++;
  }
  return n;
}

/** Render report data into `outDir` with Eleventy (not atomic; see buildSite). */
export async function renderSite(report: ReportData, outDir: string): Promise<void> {
  const elev = new Eleventy(TEMPLATES_DIR, outDir, {
    quietMode: true,
    configPath: CONFIG_PATH,
    config: (cfg: { addGlobalData: (k: string, v: unknown) => void }) => {
      cfg.addGlobalData('report', report);
    },
  });
  // Errors still throw; this only silences Eleventy's own "Wrote N files" line.
  elev.disableLogger();
  await elev.write();
}

/**
 * Assemble and publish: the output folder is checked (it must be absent, empty or an earlier report,
 * and must not hold the handbook), locked, rendered aside and swapped in (see publish.ts).
 */
export async function buildSite(h: Handbook, results: Results, outDir: string, opts: LockOptions & { extras?: ReportExtras } = {}): Promise<{ pages: number; recovered: string[] }> {
  guardOutput(outDir, h.root);
  const report = await assembleReport(h, results, opts.extras);
  let pages = 0;
  const { recovered } = await publish(outDir, h.root, async (dir) => {
    await renderSite(report, dir);
    pages = countHtml(dir);
  }, opts);
  return { pages, recovered };
}
