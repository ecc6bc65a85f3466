// A structure's cross-section drawn from its geometry: three neighbours, taper, wall, and the
// dimensions labelled. Tall structures are drawn with a compressed vertical scale, said on the
// drawing, so a 60:1 node still fits the page.
import { isElongated, isOpening, type Kind } from '../model/types.ts';
import { formatValue } from '../model/format.ts';

export interface SectionInput {
  kind: Kind;
  cd: number;
  extent?: number;
  bottomCd?: number;
  pitch?: number;
  wall?: number;
  /** For an opening that closes before its bottom: the depth where its walls meet. */
  closesAt?: number;
}

const W = 520;
const H = 360;
const MARGIN = { left: 70, right: 120, top: 40, bottom: 50 };

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

function f(x: number): string {
  return (Math.round(x * 10) / 10).toString();
}

/** Horizontal dimension line with end ticks and a label. */
function hDim(x1: number, x2: number, y: number, label: string, above: boolean): string {
  const ty = above ? y - 6 : y + 14;
  return `<g class="dim"><line x1="${f(x1)}" y1="${f(y)}" x2="${f(x2)}" y2="${f(y)}"/><line x1="${f(x1)}" y1="${f(y - 4)}" x2="${f(x1)}" y2="${f(y + 4)}"/><line x1="${f(x2)}" y1="${f(y - 4)}" x2="${f(x2)}" y2="${f(y + 4)}"/><text x="${f((x1 + x2) / 2)}" y="${f(ty)}" text-anchor="middle">${esc(label)}</text></g>`;
}

function vDim(x: number, y1: number, y2: number, label: string): string {
  return `<g class="dim"><line x1="${f(x)}" y1="${f(y1)}" x2="${f(x)}" y2="${f(y2)}"/><line x1="${f(x - 4)}" y1="${f(y1)}" x2="${f(x + 4)}" y2="${f(y1)}"/><line x1="${f(x - 4)}" y1="${f(y2)}" x2="${f(x + 4)}" y2="${f(y2)}"/><text x="${f(x + 8)}" y="${f((y1 + y2) / 2 + 4)}">${esc(label)}</text></g>`;
}

export function renderCrossSection(s: SectionInput): string {
  const extent = s.extent;
  if (extent === undefined) {
    return `<p class="muted">No cross-section: the structure does not state its ${isOpening(s.kind) ? 'depth' : 'height'}.</p>`;
  }
  const pitch = s.pitch ?? s.cd * 2.2;
  const bottom = s.bottomCd ?? s.cd;
  const n = 3;
  const spanX = pitch * (n - 1) + Math.max(s.cd, bottom) + pitch * 0.6;
  const sx = (W - MARGIN.left - MARGIN.right) / spanX;
  const drawH = H - MARGIN.top - MARGIN.bottom;
  const sy = Math.min(sx, drawH / extent);
  const compression = sx / sy;
  const x0 = MARGIN.left + (pitch * 0.3 + Math.max(s.cd, bottom) / 2) * sx;
  const yTop = MARGIN.top;
  const yBot = MARGIN.top + extent * sy;
  const opening = isOpening(s.kind);
  const closes = opening && s.closesAt !== undefined && s.closesAt < extent;
  const shapes: string[] = [];
  const centres = Array.from({ length: n }, (_, i) => x0 + i * pitch * sx);
  const trap = (cx: number, top: number, bot: number, y1: number, y2: number) =>
    `${f(cx - (top * sx) / 2)},${f(y1)} ${f(cx + (top * sx) / 2)},${f(y1)} ${f(cx + (bot * sx) / 2)},${f(y2)} ${f(cx - (bot * sx) / 2)},${f(y2)}`;
  const left = MARGIN.left - 10;
  const right = W - MARGIN.right + 10;
  if (opening) {
    shapes.push(`<rect class="solid" x="${left}" y="${f(yTop)}" width="${right - left}" height="${f(yBot - yTop + 24)}"/>`);
    const yEnd = closes ? yTop + s.closesAt! * sy : yBot;
    for (const cx of centres) shapes.push(`<polygon class="void" points="${trap(cx, s.cd, closes ? 0 : bottom, yTop, yEnd)}"/>`);
    if (closes) {
      const cx = centres[0]!;
      shapes.push(`<line class="target" x1="${f(cx - (s.cd * sx) / 2)}" y1="${f(yBot)}" x2="${f(cx + (s.cd * sx) / 2)}" y2="${f(yBot)}"/>`);
      shapes.push(`<text class="warnnote" x="${f(cx + (s.cd * sx) / 2 + 6)}" y="${f(yEnd + 4)}">closes at ${esc(formatValue(s.closesAt!, 'm', 3))}, above its target depth</text>`);
    }
  } else {
    shapes.push(`<rect class="solid" x="${left}" y="${f(yBot)}" width="${right - left}" height="24"/>`);
    for (const cx of centres) {
      shapes.push(`<polygon class="solid" points="${trap(cx, s.cd, bottom, yTop, yBot)}"/>`);
      if (s.kind === 'cylinder' && s.wall !== undefined) {
        const w = s.wall;
        shapes.push(`<polygon class="void inner" points="${trap(cx, s.cd - 2 * w, bottom - 2 * w, yTop, yBot - w * sy)}"/>`);
      }
    }
  }
  const c0 = centres[0]!;
  const c1 = centres[1]!;
  const dims: string[] = [];
  dims.push(hDim(c0 - (s.cd * sx) / 2, c0 + (s.cd * sx) / 2, yTop - 10, `CD ${formatValue(s.cd, 'm', 3)}`, true));
  if (s.bottomCd !== undefined && Math.abs(bottom - s.cd) / s.cd > 0.005) {
    dims.push(hDim(c0 - (bottom * sx) / 2, c0 + (bottom * sx) / 2, yBot + 12, `bottom ${formatValue(bottom, 'm', 3)}`, false));
  }
  if (s.pitch !== undefined) dims.push(hDim(c0, c1, yBot + 36, `pitch ${formatValue(s.pitch, 'm', 3)}`, false));
  dims.push(vDim(right + 14, yTop, yBot, `${opening ? 'depth' : 'height'} ${formatValue(extent, 'm', 3)}`));
  if (s.kind === 'cylinder' && s.wall !== undefined) {
    const cx = centres[2]!;
    const xo = cx + (s.cd * sx) / 2;
    dims.push(`<g class="dim"><text x="${f(xo + 4)}" y="${f(yTop + 16)}">wall ${esc(formatValue(s.wall, 'm', 3))}</text></g>`);
  }
  const note = compression > 1.05 ? `vertical scale compressed ×${compression >= 10 ? Math.round(compression) : compression.toFixed(1)}` : 'drawn to scale';
  const label = `${isElongated(s.kind) ? 'section across the lines' : 'section through the centres'}; ${note}${s.pitch === undefined ? '; neighbours placed for illustration (no pitch given)' : ''}`;
  return `<svg class="section" role="img" aria-label="Cross-section of the structure" viewBox="0 0 ${W} ${H + 20}" width="${W}" height="${H + 20}" style="max-width:100%;height:auto">
<style>.solid{fill:#c9d3de;stroke:#44515f;stroke-width:1}.void{fill:#fbfaf6;stroke:#44515f;stroke-width:1}.inner{fill:#fbfaf6}.dim line{stroke:#8c3b2b;stroke-width:1}.dim text{fill:#1d2733;font:11px system-ui,sans-serif}.note{fill:#5b6673;font:italic 11px system-ui,sans-serif}.target{stroke:#b8432f;stroke-dasharray:4 3}.warnnote{fill:#b8432f;font:11px system-ui,sans-serif}</style>
${shapes.join('\n')}
${dims.join('\n')}
<text class="note" x="${MARGIN.left - 10}" y="${H + 14}">${esc(label)}</text>
</svg>`;
}
