// Figures engines hand to the report as data (never as drawings): drawn here as SVG.
import type { Figure } from '../engines/quantity.ts';
import { formatValue } from '../model/format.ts';

const W = 520;
const H = 360;

/** The fill of an opening at successive times: film fronts as outlines, a trapped void marked. */
function profileHistory(f: Extract<Figure, { type: 'profile-history' }>): string {
  const first = f.frames[0]!;
  const n = first.widths.length;
  const dz = f.depth / n;
  const maxW = Math.max(...first.widths);
  const sy = (H - 60) / f.depth;
  const sx = Math.min((W - 140) / maxW, sy * 50);
  const cx = 60 + (maxW * sx) / 2;
  const y = (z: number) => 30 + z * sy;
  // Up to seven frames, evenly through the march, and always the last.
  const step = Math.max(1, Math.ceil((f.frames.length - 1) / 6));
  const frames = f.frames.filter((_, i) => i % step === 0 || i === f.frames.length - 1);
  const colour = (k: number) => {
    const t = frames.length > 1 ? k / (frames.length - 1) : 1;
    return `rgb(${Math.round(47 + t * 137)},${Math.round(125 - t * 58)},${Math.round(91 - t * 44)})`;
  };
  const outline = (widths: number[], bottom: number) => {
    const left: string[] = [];
    const right: string[] = [];
    for (let i = 0; i < n; i++) {
      const z = (i + 0.5) * dz;
      if (z > bottom) break;
      left.push(`${(cx - (widths[i]! * sx) / 2).toFixed(1)},${y(z).toFixed(1)}`);
      right.unshift(`${(cx + (widths[i]! * sx) / 2).toFixed(1)},${y(z).toFixed(1)}`);
    }
    return [...left, ...right].join(' ');
  };
  const parts: string[] = [];
  parts.push(`<rect x="30" y="30" width="${(maxW * sx + 60).toFixed(1)}" height="${(f.depth * sy + 10).toFixed(1)}" fill="#c9d3de"/>`);
  parts.push(`<polygon points="${outline(first.widths, first.bottom)}" fill="#e8dcc3" stroke="#44515f" stroke-width="1"/>`);
  frames.forEach((fr, k) => {
    if (k === 0) return;
    parts.push(`<polyline points="${outline(fr.widths, fr.bottom)}" fill="none" stroke="${colour(k)}" stroke-width="1.2"/>`);
  });
  if (f.void) {
    parts.push(`<rect x="${(cx - 6).toFixed(1)}" y="${y(f.void.from).toFixed(1)}" width="12" height="${Math.max(2, (f.void.to - f.void.from) * sy).toFixed(1)}" fill="#b8432f" opacity="0.75"/>`);
    parts.push(`<text x="${(cx + 12).toFixed(1)}" y="${(y(f.void.from) + 14).toFixed(1)}" class="lab">void ${formatValue(f.void.to - f.void.from, 'm', 3)}</text>`);
  }
  const compression = sx / sy;
  parts.push(`<text x="30" y="${H + 8}" class="note">${f.elongated ? 'trench' : 'hole'} section; film fronts green (early) to rust (closed)${compression > 1.05 ? `; horizontal scale ×${compression.toFixed(compression >= 10 ? 0 : 1)}` : ''}</text>`);
  return `<svg class="figure" role="img" aria-label="Fill profile at successive times" viewBox="0 0 ${W} ${H + 16}" width="${W}" height="${H + 16}" style="max-width:100%;height:auto"><style>.lab{fill:#b8432f;font:11px system-ui,sans-serif}.note{fill:#5b6673;font:italic 11px system-ui,sans-serif}</style>${parts.join('')}</svg>`;
}

const STYLE = '<style>.lab{fill:#44515f;font:11px system-ui,sans-serif}.note{fill:#5b6673;font:italic 11px system-ui,sans-serif}</style>';

function svg(label: string, body: string, h = H + 16): string {
  return `<svg class="figure" role="img" aria-label="${label}" viewBox="0 0 ${W} ${h}" width="${W}" height="${h}" style="max-width:100%;height:auto">${STYLE}${body}</svg>`;
}

/** A tidy tick step for a range: 1, 2 or 5 times a power of ten. */
function tickStep(span: number, count = 5): number {
  const raw = span / count;
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
}

/** Radial and hoop stress against distance from the via centre, in multiples of its radius. */
function stressProfile(f: Extract<Figure, { type: 'stress-profile' }>): string {
  const [x0, y0, pw, ph] = [70, 20, W - 100, H - 70];
  const rMax = f.points[f.points.length - 1]!.r / f.radius;
  const peak = Math.max(...f.points.map((p) => Math.max(Math.abs(p.radial), Math.abs(p.hoop)))) / 1e6 || 1;
  const step = tickStep(2 * peak);
  const yTop = Math.ceil(peak / step) * step;
  const px = (x: number) => x0 + ((x - 1) / (rMax - 1)) * pw;
  const py = (mpa: number) => y0 + ((yTop - mpa) / (2 * yTop)) * ph;
  const parts: string[] = [`<rect x="${x0}" y="${y0}" width="${pw}" height="${ph}" fill="#f6f7f9" stroke="#c9d3de"/>`];
  for (let t = -yTop; t <= yTop + 1e-9; t += step) {
    parts.push(`<line x1="${x0}" x2="${x0 + pw}" y1="${py(t).toFixed(1)}" y2="${py(t).toFixed(1)}" stroke="${Math.abs(t) < 1e-9 ? '#8a96a3' : '#e1e6ec'}"/>`);
    parts.push(`<text x="${x0 - 6}" y="${(py(t) + 4).toFixed(1)}" text-anchor="end" class="lab">${Number(t.toPrecision(6))}</text>`);
  }
  for (let x = 1; x <= rMax + 1e-9; x += 1) {
    parts.push(`<text x="${px(x).toFixed(1)}" y="${y0 + ph + 16}" text-anchor="middle" class="lab">${x}</text>`);
  }
  const line = (key: 'radial' | 'hoop') => f.points.map((p) => `${px(p.r / f.radius).toFixed(1)},${py(p[key] / 1e6).toFixed(1)}`).join(' ');
  parts.push(`<polyline points="${line('radial')}" fill="none" stroke="#2f7d5b" stroke-width="2"/>`);
  parts.push(`<polyline points="${line('hoop')}" fill="none" stroke="#b8432f" stroke-width="2" stroke-dasharray="6 3"/>`);
  parts.push(`<text x="${x0 + pw - 8}" y="${y0 + 16}" text-anchor="end" class="lab"><tspan fill="#2f7d5b">━ radial σ_rr</tspan>  <tspan fill="#b8432f">╍ hoop σ_θθ</tspan></text>`);
  parts.push(`<text x="${x0 + pw / 2}" y="${y0 + ph + 32}" text-anchor="middle" class="lab">distance from the via centre, r / a (a = ${formatValue(f.radius, 'm', 3)})</text>`);
  parts.push(`<text transform="translate(16 ${y0 + ph / 2}) rotate(-90)" text-anchor="middle" class="lab">stress in the silicon (MPa), tensile positive</text>`);
  return svg('Stress in the silicon against distance from the via centre', parts.join(''), H);
}

/** Mobility shift around a via, channel along x, with the via and the keep-out circle drawn. */
function mobilityMap(f: Extract<Figure, { type: 'mobility-map' }>): string {
  const size = H - 40;
  const [x0, y0] = [30, 20];
  const cell = size / f.n;
  const scale = size / (2 * f.extent);
  const clamp = 2 * f.threshold;
  const colour = (v: number) => {
    const t = Math.max(-1, Math.min(1, v / clamp));
    // Gain (positive) to teal, loss (negative) to ochre; white at zero.
    const [r, g, b] = t >= 0 ? [255 - t * 208, 255 - t * 130, 255 - t * 164] : [255 + t * 40, 255 + t * 112, 255 + t * 200];
    return `rgb(${Math.round(r)},${Math.round(g)},${Math.round(b)})`;
  };
  const parts: string[] = [];
  for (let j = 0; j < f.n; j++) {
    for (let i = 0; i < f.n; i++) {
      const v = f.values[j * f.n + i];
      if (v === null || v === undefined) continue;
      parts.push(`<rect x="${(x0 + i * cell).toFixed(1)}" y="${(y0 + j * cell).toFixed(1)}" width="${(cell + 0.3).toFixed(2)}" height="${(cell + 0.3).toFixed(2)}" fill="${colour(v)}"/>`);
    }
  }
  const cx = x0 + size / 2;
  const cy = y0 + size / 2;
  parts.push(`<circle cx="${cx}" cy="${cy}" r="${(f.radius * scale).toFixed(1)}" fill="#8a5a2b" stroke="#44515f"/>`);
  parts.push(`<circle cx="${cx}" cy="${cy}" r="${(f.keepOut * scale).toFixed(1)}" fill="none" stroke="#1d2733" stroke-width="1.5" stroke-dasharray="5 3" data-keep-out="${f.keepOut}"/>`);
  parts.push(`<rect x="${x0}" y="${y0}" width="${size}" height="${size}" fill="none" stroke="#c9d3de"/>`);
  // Legend and labels on the right.
  const lx = x0 + size + 24;
  parts.push(`<text x="${lx}" y="${y0 + 12}" class="lab">${f.channel}</text>`);
  parts.push(`<text x="${lx}" y="${y0 + 28}" class="lab">channel along →</text>`);
  const steps = 9;
  const top = y0 + 40;
  for (let k = 0; k < steps; k++) {
    const v = clamp - (2 * clamp * k) / (steps - 1);
    parts.push(`<rect x="${lx}" y="${top + k * 16}" width="18" height="16" fill="${colour(v)}" stroke="#c9d3de" stroke-width="0.5"/>`);
    if (k % 2 === 0) parts.push(`<text x="${lx + 24}" y="${top + 12 + k * 16}" class="lab">${v > 0 ? '+' : ''}${(v * 100).toFixed(1)} %</text>`);
  }
  const below = top + steps * 16;
  ['Δμ/μ: gain teal,', 'loss ochre', `dashed: keep-out,`, `r = ${formatValue(f.keepOut, 'm', 3)}`, `threshold ${Number((f.threshold * 100).toPrecision(3))} %`].forEach((t, k) =>
    parts.push(`<text x="${lx}" y="${below + 18 + k * 16}" class="lab">${t}</text>`),
  );
  parts.push(`<text x="${x0}" y="${y0 + size + 16}" class="note">square ${formatValue(2 * f.extent, 'm', 3)} wide, centred on the via; colours saturate at twice the threshold</text>`);
  return svg(`Mobility shift around the via for the ${f.channel} channel, keep-out circle dashed`, parts.join(''));
}

export function renderFigure(f: Figure): string {
  switch (f.type) {
    case 'profile-history':
      return profileHistory(f);
    case 'stress-profile':
      return stressProfile(f);
    case 'mobility-map':
      return mobilityMap(f);
  }
}
