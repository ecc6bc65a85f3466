// Figures engines hand to the report as data (never as drawings): drawn here as SVG.
import type { Figure } from '../engines/quantity.ts';
import { formatValue } from './format.ts';

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

export function renderFigure(f: Figure): string {
  switch (f.type) {
    case 'profile-history':
      return profileHistory(f);
  }
}
