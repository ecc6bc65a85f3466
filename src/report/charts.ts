// Charts: Vega-Lite specs compiled to Vega and rendered to SVG at build time, so the site works
// offline and without script. Compiling and parsing a spec costs far more than rendering it, so
// each kind of chart is compiled once into a View that is fed new data (and an axis title signal)
// per chart; rendered SVG is also cached by a hash of the kind and its inputs.
import { createHash } from 'node:crypto';
import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';

export const PALETTE = {
  pass: '#2f7d5b',
  fail: '#b8432f',
  // A failure excused by a waiver: neither the green of a pass nor the red of a fail (indigo).
  waived: '#4a55a2',
  incomplete: '#a7791b',
  'not-applicable': '#8a8f98',
  ink: '#1d2733',
  grid: '#d9dee5',
};

/** The verdicts the overview's count chart has a bar for, in order. */
const COUNTED = ['pass', 'fail', 'waived', 'incomplete'];

/** Colours of the verdicts a chart marks (a waived value is still shown where it lies). */
const STATUS_SCALE = { domain: ['pass', 'fail', 'waived'], range: [PALETTE.pass, PALETTE.fail, PALETTE.waived] };

const CONFIG = {
  font: 'system-ui, sans-serif',
  axis: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, gridColor: PALETTE.grid, domainColor: '#9aa3ad', tickColor: '#9aa3ad', labelFontSize: 11, titleFontSize: 12 },
  view: { stroke: null },
  background: 'transparent',
};

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

interface ChartKind {
  spec: TopLevelSpec;
  /** Data sources fed per chart. */
  datasets: string[];
  /** The x axis takes its title from the signal `x_title` (and the y axis from `y_title`). */
  xTitleSignal: boolean;
  yTitleSignal?: boolean;
}

const KINDS: Record<string, ChartKind> = {
  value: {
    datasets: ['nominals', 'values', 'limit'],
    xTitleSignal: true,
    spec: {
      $schema: SCHEMA,
      width: 520,
      height: { step: 24 },
      layer: [
        {
          data: { name: 'nominals' },
          mark: { type: 'point', shape: 'circle', size: 70, filled: false, color: PALETTE.ink, opacity: 0.6 },
          encoding: {
            y: { field: 'label', type: 'nominal', sort: null, title: null, axis: { labelLimit: 220 } },
            x: { field: 'value', type: 'quantitative', title: 'x', scale: { zero: false, nice: true } },
          },
        },
        {
          data: { name: 'values' },
          mark: { type: 'point', shape: 'diamond', size: 110, filled: true },
          encoding: {
            y: { field: 'label', type: 'nominal', sort: null },
            x: { field: 'value', type: 'quantitative' },
            color: { field: 'status', type: 'nominal', scale: STATUS_SCALE, legend: null },
          },
        },
        {
          data: { name: 'limit' },
          mark: { type: 'rule', color: PALETTE.fail, strokeDash: [5, 3], strokeWidth: 1.5 },
          encoding: { x: { field: 'limit', type: 'quantitative' } },
        },
        {
          data: { name: 'limit' },
          mark: { type: 'text', color: PALETTE.fail, dy: -8, align: 'left', dx: 3, fontSize: 10, baseline: 'bottom' },
          encoding: { x: { field: 'limit', type: 'quantitative' }, y: { value: 0 }, text: { value: 'limit' } },
        },
      ],
    } as TopLevelSpec,
  },
  margin: {
    datasets: ['rows'],
    xTitleSignal: false,
    spec: {
      $schema: SCHEMA,
      width: 520,
      height: { step: 22 },
      data: { name: 'rows' },
      layer: [
        {
          mark: { type: 'bar', cornerRadiusEnd: 2 },
          encoding: {
            y: { field: 'label', type: 'nominal', sort: null, title: null, axis: { labelLimit: 220 } },
            x: { field: 'shown', type: 'quantitative', title: 'margin to the limit (%, clipped at ±100)', scale: { domain: { unionWith: [-10, 10] }, clamp: true } },
            color: { field: 'status', type: 'nominal', scale: STATUS_SCALE, legend: null },
          },
        },
        { mark: { type: 'rule', color: PALETTE.ink, strokeWidth: 1.5 }, encoding: { x: { datum: 0, type: 'quantitative' } } },
        {
          mark: { type: 'text', align: 'left', dx: 4, fontSize: 10, color: PALETTE.ink },
          encoding: { y: { field: 'label', type: 'nominal', sort: null }, x: { field: 'shown', type: 'quantitative' }, text: { field: 'pct' } },
        },
      ],
    } as TopLevelSpec,
  },
  trend: {
    datasets: ['points'],
    xTitleSignal: false,
    spec: {
      $schema: SCHEMA,
      width: 520,
      height: 180,
      data: { name: 'points' },
      layer: [
        {
          mark: { type: 'line', color: PALETTE.ink, strokeWidth: 1.2, interpolate: 'step-after' },
          encoding: {
            x: { field: 'index', type: 'quantitative', title: 'revisions that changed the handbook, oldest to newest', axis: { tickMinStep: 1, format: 'd' } },
            y: { field: 'shown', type: 'quantitative', title: 'margin to the limit (%, clipped at ±100)', scale: { domain: { unionWith: [-10, 10] }, clamp: true } },
          },
        },
        {
          mark: { type: 'point', filled: true, size: 42 },
          encoding: {
            x: { field: 'index', type: 'quantitative' },
            y: { field: 'shown', type: 'quantitative' },
            color: { field: 'status', type: 'nominal', scale: STATUS_SCALE, legend: null },
            shape: { field: 'status', type: 'nominal', scale: { domain: ['pass', 'fail', 'waived'], range: ['circle', 'cross', 'diamond'] }, legend: null },
            tooltip: [{ field: 'commit' }, { field: 'day' }, { field: 'pct' }],
          },
        },
        { mark: { type: 'rule', color: PALETTE.fail, strokeDash: [4, 3] }, encoding: { y: { datum: 0, type: 'quantitative' } } },
      ],
    } as TopLevelSpec,
  },
  sweep: {
    datasets: ['curve', 'companion', 'overlay', 'own', 'limit'],
    xTitleSignal: true,
    yTitleSignal: true,
    spec: {
      $schema: SCHEMA,
      width: 520,
      height: 260,
      layer: [
        {
          data: { name: 'curve' },
          mark: { type: 'line', color: PALETTE.ink, strokeWidth: 1.8, interpolate: 'monotone' },
          encoding: {
            x: { field: 'x', type: 'quantitative', title: 'x', scale: { zero: false } },
            y: { field: 'y', type: 'quantitative', title: 'y', scale: { zero: false } },
          },
        },
        {
          data: { name: 'companion' },
          mark: { type: 'line', color: '#7a8aa0', strokeWidth: 1.5, strokeDash: [2, 2], interpolate: 'monotone' },
          encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } },
        },
        {
          data: { name: 'limit' },
          mark: { type: 'rule', color: PALETTE.fail, strokeDash: [5, 3], strokeWidth: 1.5 },
          encoding: { y: { field: 'limit', type: 'quantitative' } },
        },
        {
          data: { name: 'limit' },
          mark: { type: 'text', color: PALETTE.fail, align: 'left', dx: 4, dy: -6, fontSize: 10 },
          encoding: { y: { field: 'limit', type: 'quantitative' }, x: { value: 0 }, text: { value: 'limit' } },
        },
        {
          data: { name: 'overlay' },
          mark: { type: 'point', shape: 'circle', size: 60, filled: false, color: PALETTE.ink, strokeWidth: 1.5 },
          encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } },
        },
        {
          data: { name: 'own' },
          mark: { type: 'point', shape: 'diamond', size: 120, filled: true },
          encoding: {
            x: { field: 'x', type: 'quantitative' },
            y: { field: 'y', type: 'quantitative' },
            color: { field: 'status', type: 'nominal', scale: STATUS_SCALE, legend: null },
          },
        },
      ],
    } as TopLevelSpec,
  },
  counts: {
    datasets: ['rows'],
    xTitleSignal: false,
    spec: {
      $schema: SCHEMA,
      width: 360,
      height: { step: 26 },
      data: { name: 'rows' },
      layer: [
        {
          mark: { type: 'bar', cornerRadiusEnd: 2 },
          encoding: {
            y: { field: 'status', type: 'nominal', sort: COUNTED, title: null },
            x: { field: 'n', type: 'quantitative', title: 'verdicts', axis: { tickMinStep: 1 } },
            color: { field: 'status', type: 'nominal', scale: { domain: COUNTED, range: [PALETTE.pass, PALETTE.fail, PALETTE.waived, PALETTE.incomplete] }, legend: null },
          },
        },
        {
          mark: { type: 'text', align: 'left', dx: 4, color: PALETTE.ink },
          encoding: { y: { field: 'status', type: 'nominal', sort: COUNTED }, x: { field: 'n', type: 'quantitative' }, text: { field: 'n' } },
        },
      ],
    } as TopLevelSpec,
  },
  window: {
    datasets: ['cells', 'box', 'nominal', 'edges'],
    xTitleSignal: true,
    yTitleSignal: true,
    spec: {
      $schema: SCHEMA,
      width: 420,
      height: 340,
      layer: [
        {
          data: { name: 'cells' },
          mark: { type: 'rect', strokeWidth: 0 },
          encoding: {
            x: { field: 'x0', type: 'quantitative', title: 'x', scale: { zero: false, nice: false } },
            x2: { field: 'x1' },
            y: { field: 'y0', type: 'quantitative', title: 'y', scale: { zero: false, nice: false } },
            y2: { field: 'y1' },
            color: { field: 'state', type: 'nominal', scale: { domain: ['pass', 'fail', 'outside'], range: ['#cfe6da', '#f2c9bf', '#e3e5e8'] }, legend: null },
          },
        },
        {
          data: { name: 'box' },
          mark: { type: 'rect', fill: null, stroke: PALETTE.ink, strokeWidth: 1.5, strokeDash: [4, 2] },
          encoding: { x: { field: 'x0', type: 'quantitative' }, x2: { field: 'x1' }, y: { field: 'y0', type: 'quantitative' }, y2: { field: 'y1' } },
        },
        {
          data: { name: 'edges' },
          mark: { type: 'point', shape: 'diamond', size: 70, filled: true, color: PALETTE.ink },
          encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } },
        },
        {
          data: { name: 'nominal' },
          mark: { type: 'point', shape: 'cross', size: 140, filled: true, color: PALETTE.ink },
          encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } },
        },
      ],
    } as TopLevelSpec,
  },
  tornado: {
    datasets: ['bars', 'ends', 'nominal', 'limit'],
    xTitleSignal: true,
    spec: {
      $schema: SCHEMA,
      width: 520,
      height: { step: 26 },
      layer: [
        {
          data: { name: 'bars' },
          mark: { type: 'bar', color: '#c5ccd6', height: 12 },
          encoding: {
            y: { field: 'label', type: 'nominal', sort: { field: 'rank', op: 'min', order: 'ascending' }, title: null, axis: { labelLimit: 260 } },
            x: { field: 'lowest', type: 'quantitative', title: 'x', scale: { zero: false, nice: true } },
            x2: { field: 'highest' },
          },
        },
        {
          data: { name: 'ends' },
          mark: { type: 'point', filled: true, size: 70 },
          encoding: {
            y: { field: 'label', type: 'nominal', sort: { field: 'rank', op: 'min', order: 'ascending' } },
            x: { field: 'value', type: 'quantitative' },
            color: { field: 'status', type: 'nominal', scale: STATUS_SCALE, legend: null },
            shape: { field: 'end', type: 'nominal', scale: { domain: ['low', 'high'], range: ['triangle-left', 'triangle-right'] }, legend: null },
          },
        },
        { data: { name: 'nominal' }, mark: { type: 'rule', color: PALETTE.ink, strokeWidth: 1.5 }, encoding: { x: { field: 'value', type: 'quantitative' } } },
        { data: { name: 'limit' }, mark: { type: 'rule', color: PALETTE.fail, strokeDash: [5, 3], strokeWidth: 1.5 }, encoding: { x: { field: 'limit', type: 'quantitative' } } },
      ],
    } as TopLevelSpec,
  },
};

export type ChartKindName = keyof typeof KINDS;

interface Compiled {
  view: vega.View;
  queue: Promise<unknown>;
}
const views = new Map<string, Compiled>();
const svgCache = new Map<string, string>();

function compiledView(kind: string): Compiled {
  let c = views.get(kind);
  if (c) return c;
  const k = KINDS[kind]!;
  const vg = compile({ ...k.spec, config: CONFIG } as TopLevelSpec).spec as vega.Spec & { signals?: vega.Signal[]; axes?: Array<Record<string, unknown>> };
  if (k.xTitleSignal) {
    vg.signals = [...(vg.signals ?? []), { name: 'x_title', value: '' }];
    for (const axis of vg.axes ?? []) if (axis.title === 'x') axis.title = { signal: 'x_title' };
  }
  if (k.yTitleSignal) {
    vg.signals = [...(vg.signals ?? []), { name: 'y_title', value: '' }];
    for (const axis of vg.axes ?? []) if (axis.title === 'y') axis.title = { signal: 'y_title' };
  }
  c = { view: new vega.View(vega.parse(vg), { renderer: 'none' }), queue: Promise.resolve() };
  views.set(kind, c);
  return c;
}

/** Render one chart of a kind with its data; the shared View is used by one chart at a time. */
export async function renderChart(kind: ChartKindName, datasets: Record<string, unknown[]>, xTitle = '', yTitle = ''): Promise<string> {
  const key = createHash('sha256').update(JSON.stringify([kind, datasets, xTitle, yTitle])).digest('hex');
  const hit = svgCache.get(key);
  if (hit) return hit;
  const c = compiledView(kind);
  const job = c.queue.then(async () => {
    const view = c.view;
    for (const name of KINDS[kind]!.datasets) view.data(name, (datasets[name] ?? []).map((r) => ({ ...(r as object) })));
    if (KINDS[kind]!.xTitleSignal) view.signal('x_title', xTitle);
    if (KINDS[kind]!.yTitleSignal) view.signal('y_title', yTitle);
    await view.runAsync();
    return (await view.toSVG())
      .replace(/^<svg /, '<svg role="img" ')
      .replace(/^(<svg[^>]*?) viewBox="[^"]*"/, '$1')
      .replace(/ width="(\d+(?:\.\d+)?)" height="(\d+(?:\.\d+)?)"/, (_m, w, h) => ` width="${w}" height="${h}" viewBox="0 0 ${w} ${h}" style="max-width:100%;height:auto"`);
  });
  c.queue = job.catch(() => undefined);
  const svg = await job;
  svgCache.set(key, svg);
  return svg;
}

export interface MarginBar {
  label: string;
  margin: number;
  status: string;
}

/** Signed margin per item, as horizontal bars around zero (the limit). */
export function marginChart(rows: MarginBar[]): Promise<string> {
  const shown = rows.map((r) => ({ label: r.label, status: r.status, shown: Math.max(-1, Math.min(1, r.margin)) * 100, pct: `${(r.margin * 100).toFixed(1)} %` }));
  return renderChart('margin', { rows: shown });
}

export interface ValuePoint {
  label: string;
  value: number;
  nominal?: number;
  status: string;
}

/** Each structure's deciding value against the rule's limit, in display units; nominal hollow. */
export function valueChart(rows: ValuePoint[], limits: number[], axisTitle: string): Promise<string> {
  return renderChart(
    'value',
    {
      values: rows.map((r) => ({ label: r.label, value: r.value, status: r.status })),
      nominals: rows.filter((r) => r.nominal !== undefined).map((r) => ({ label: r.label, value: r.nominal })),
      limit: limits.map((limit) => ({ limit })),
    },
    axisTitle,
  );
}

export interface WindowCellShown {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
  state: 'pass' | 'fail' | 'outside';
}

/**
 * A process window as a heat map in display units: pass and fail cells of the refined grid (grey
 * where the structure breaks its relations), the nominal point (✚), its tolerance box (dashed) and
 * the edges through it (◆).
 */
export function windowChart(
  cells: WindowCellShown[],
  nominal: { x: number; y: number },
  box: { x0: number; x1: number; y0: number; y1: number } | null,
  edges: Array<{ x: number; y: number }>,
  xTitle: string,
  yTitle: string,
): Promise<string> {
  return renderChart('window', { cells, box: box ? [box] : [], nominal: [nominal], edges }, xTitle, yTitle);
}

export interface TornadoBar {
  label: string;
  /** The value with the input at the low and at the high end of its tolerance, in display units. */
  low: number;
  high: number;
  lowStatus: 'pass' | 'fail';
  highStatus: 'pass' | 'fail';
}

/**
 * One bar per toleranced input, largest swing first: the value with the input at each end of its
 * tolerance (◀ low end, ▶ high end, coloured by whether that end passes), the nominal value (solid)
 * and the limit (dashed).
 */
export function tornadoChart(rows: TornadoBar[], nominal: number, limits: number[], axisTitle: string): Promise<string> {
  return renderChart(
    'tornado',
    {
      bars: rows.map((r, rank) => ({ label: r.label, rank, lowest: Math.min(r.low, r.high), highest: Math.max(r.low, r.high) })),
      ends: rows.flatMap((r, rank) => [
        { label: r.label, rank, value: r.low, end: 'low', status: r.lowStatus },
        { label: r.label, rank, value: r.high, end: 'high', status: r.highStatus },
      ]),
      nominal: [{ value: nominal }],
      limit: limits.map((limit) => ({ limit })),
    },
    axisTitle,
  );
}

/** A quantity against one of its inputs, the structure's own point and the rule's limit. */
export function sweepChart(
  curve: Array<{ x: number; y: number }>,
  own: { x: number; y: number; status: string },
  limits: number[],
  xTitle: string,
  yTitle: string,
  companion: Array<{ x: number; y: number }> = [],
  overlay: Array<{ x: number; y: number }> = [],
): Promise<string> {
  return renderChart('sweep', { curve, companion, overlay, own: [own], limit: limits.map((limit) => ({ limit })) }, xTitle, yTitle);
}

/** Count of verdicts by status, one bar each (waived only when there are some: a handbook without
 * waivers keeps its chart). */
export function countsChart(counts: Record<string, number>): Promise<string> {
  const shown = COUNTED.filter((status) => status !== 'waived' || (counts.waived ?? 0) > 0);
  return renderChart('counts', { rows: shown.map((status) => ({ status, n: counts[status] ?? 0 })) });
}

export interface TrendPoint {
  index: number;
  commit: string;
  day: string;
  margin: number;
  status: string;
}

/** A verdict's margin at each revision that changed the handbook: a step line, a mark per
 * revision coloured and shaped by its verdict, the limit as a dashed line at zero. */
export function trendChart(points: TrendPoint[]): Promise<string> {
  const shown = points.map((p) => ({ ...p, shown: Math.max(-1, Math.min(1, p.margin)) * 100, pct: `${(p.margin * 100).toFixed(1)} %` }));
  return renderChart('trend', { points: shown });
}
