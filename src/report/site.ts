// Render the report with Eleventy into a fresh temporary folder beside the target, then swap it
// in. A failed build leaves the previous site as it was; readers never see a half-written site.
import { existsSync, mkdirSync, renameSync, rmSync, readdirSync, statSync } from 'node:fs';
import { dirname, basename, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import Eleventy from '@11ty/eleventy';
import type { Results } from '../checker/evaluate.ts';
import type { Handbook } from '../model/types.ts';
import { assembleReport, type ReportData } from './assemble.ts';

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

/** Assemble, render to a temporary folder and swap it in place of `outDir`. */
export async function buildSite(h: Handbook, results: Results, outDir: string): Promise<{ pages: number }> {
  const report = await assembleReport(h, results);
  const parent = dirname(outDir);
  mkdirSync(parent, { recursive: true });
  const tmp = join(parent, `.${basename(outDir)}-building-${process.pid}`);
  const old = join(parent, `.${basename(outDir)}-previous-${process.pid}`);
  rmSync(tmp, { recursive: true, force: true });
  try {
    await renderSite(report, tmp);
  } catch (err) {
    rmSync(tmp, { recursive: true, force: true });
    throw err;
  }
  const pages = countHtml(tmp);
  if (existsSync(outDir)) renameSync(outDir, old);
  renameSync(tmp, outDir);
  rmSync(old, { recursive: true, force: true });
  return { pages };
}
