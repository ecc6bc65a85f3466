// Charts: Vega-Lite specs compiled to Vega and rendered to SVG at build time, so the site works
// offline and without script. Rendered SVG is cached by a hash of the spec and data.
import { createHash } from 'node:crypto';
import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';

const svgCache = new Map<string, string>();

export const PALETTE = {
  pass: '#2f7d5b',
  fail: '#b8432f',
  incomplete: '#a7791b',
  'not-applicable': '#8a8f98',
  ink: '#1d2733',
  grid: '#d9dee5',
};

const CONFIG = {
  font: 'system-ui, sans-serif',
  axis: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, gridColor: PALETTE.grid, domainColor: '#9aa3ad', tickColor: '#9aa3ad', labelFontSize: 11, titleFontSize: 12 },
  view: { stroke: null },
  background: null,
};

export async function renderChart(spec: TopLevelSpec): Promise<string> {
  const key = createHash('sha256').update(JSON.stringify(spec)).digest('hex');
  const hit = svgCache.get(key);
  if (hit) return hit;
  const vgSpec = compile({ ...spec, config: { ...CONFIG, ...(spec.config ?? {}) } } as TopLevelSpec).spec;
  const view = new vega.View(vega.parse(vgSpec), { renderer: 'none' });
  const svg = (await view.toSVG())
    .replace(/^<svg /, '<svg role="img" ')
    .replace(/ width="(\d+(?:\.\d+)?)" height="(\d+(?:\.\d+)?)"/, (_m, w, h) => ` width="${w}" height="${h}" viewBox="0 0 ${w} ${h}" style="max-width:100%;height:auto"`);
  view.finalize();
  svgCache.set(key, svg);
  return svg;
}

export interface MarginBar {
  label: string;
  margin: number;
  status: string;
}

/** Signed margin per item, as horizontal bars around zero (the limit). */
export function marginChartSpec(rows: MarginBar[], title: string): TopLevelSpec {
  const clipped = rows.map((r) => ({ ...r, shown: Math.max(-1, Math.min(1, r.margin)) * 100, pct: `${(r.margin * 100).toFixed(1)} %` }));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 520,
    height: { step: 22 },
    title: { text: title, anchor: 'start', fontSize: 13, color: PALETTE.ink },
    data: { values: clipped },
    layer: [
      {
        mark: { type: 'bar', cornerRadiusEnd: 2 },
        encoding: {
          y: { field: 'label', type: 'nominal', sort: null, title: null, axis: { labelLimit: 220 } },
          x: { field: 'shown', type: 'quantitative', title: 'margin to the limit (%, clipped at ±100)', scale: { domain: [-100, 100] } },
          color: {
            field: 'status',
            type: 'nominal',
            scale: { domain: ['pass', 'fail'], range: [PALETTE.pass, PALETTE.fail] },
            legend: null,
          },
        },
      },
      { mark: { type: 'rule', color: PALETTE.ink, strokeWidth: 1.5 }, data: { values: [{ x: 0 }] }, encoding: { x: { field: 'x', type: 'quantitative' } } },
      {
        mark: { type: 'text', align: 'left', dx: 4, fontSize: 10, color: PALETTE.ink },
        encoding: {
          y: { field: 'label', type: 'nominal', sort: null },
          x: { field: 'shown', type: 'quantitative' },
          text: { field: 'pct' },
        },
      },
    ],
  } as TopLevelSpec;
}

/** Count of verdicts by status, one bar each. */
export function countsChartSpec(counts: Record<string, number>): TopLevelSpec {
  const order = ['pass', 'fail', 'incomplete'];
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: 360,
    height: { step: 26 },
    data: { values: order.map((s) => ({ status: s === 'incomplete' ? 'incomplete' : s, n: counts[s] ?? 0 })) },
    layer: [
      {
        mark: { type: 'bar', cornerRadiusEnd: 2 },
        encoding: {
          y: { field: 'status', type: 'nominal', sort: order, title: null },
          x: { field: 'n', type: 'quantitative', title: 'verdicts', axis: { tickMinStep: 1 } },
          color: { field: 'status', type: 'nominal', scale: { domain: order, range: [PALETTE.pass, PALETTE.fail, PALETTE.incomplete] }, legend: null },
        },
      },
      {
        mark: { type: 'text', align: 'left', dx: 4, color: PALETTE.ink },
        encoding: { y: { field: 'status', type: 'nominal', sort: order }, x: { field: 'n', type: 'quantitative' }, text: { field: 'n' } },
      },
    ],
  } as TopLevelSpec;
}
