// Geometry of tall and deep structures: the shape facts every other engine reads.
// Conventions: `cd` is the top critical dimension (outer diameter of a cylinder); the sidewall angle
// is measured in the solid, 90° vertical (see the format reference). A straight sidewall is assumed.
import { isElongated, isOpening } from '../../model/types.ts';
import { noValue, variant, type Engine, type NoValue, type QuantityDef, type Shape } from '../quantity.ts';

const ELEMENTARY = 'Elementary geometry of a straight-walled frustum or prism (e.g. CRC Standard Mathematical Tables, mensuration of solids)';

/** Vertical extent: depth for openings, height for standing kinds. */
function extentInput(shape: Shape): string {
  return isOpening(shape.kind) ? 'geometry.depth' : 'geometry.height';
}
function extentSymbol(shape: Shape): string {
  return isOpening(shape.kind) ? 'D' : 'H';
}

/** Angles within this of 90° count as vertical: a value written as "90 deg" is exactly vertical. */
const VERTICAL_TOLERANCE = 1e-9;

/** cot θ, exactly zero for a vertical wall (floating-point cos(π/2) is 6e-17, not 0). */
export function cotangent(angle: number): number {
  // Stryker disable next-line EqualityOperator: `<` and `<=` differ only if |θ − π/2| were exactly the double 1e-9; near π/2 that difference is exact and a multiple of 2⁻⁵², which 1e-9 is not.
  return Math.abs(angle - Math.PI / 2) < VERTICAL_TOLERANCE ? 0 : Math.cos(angle) / Math.sin(angle);
}

/** Bottom CD of a straight tapered sidewall. Openings narrow downward when θ < 90°, standing bodies widen. */
export function bottomCd(cd: number, extent: number, angle: number, opening: boolean): number {
  const cot = cotangent(angle);
  return opening ? cd - 2 * extent * cot : cd + 2 * extent * cot;
}

/** Lateral area of a conical frustum with top and bottom diameters d1, d2 and height h. */
export function frustumLateralArea(d1: number, d2: number, h: number): number {
  const slant = Math.hypot(h, (d1 - d2) / 2);
  return (Math.PI * (d1 + d2) * slant) / 2;
}

/** Volume of a conical frustum: πh(d1² + d1·d2 + d2²)/12. */
export function frustumVolume(d1: number, d2: number, h: number): number {
  return (Math.PI * h * (d1 * d1 + d1 * d2 + d2 * d2)) / 12;
}

/**
 * Cavity of a hollow cylinder (a cup): top diameter CD − 2t_w; its floor lies one wall thickness
 * above the base, where the outer diameter has tapered to CD_b + (CD − CD_b)·t_w/H. A cavity that
 * narrows to nothing above its floor (a re-entrant cup) ends in a point: it is a cone to that depth.
 */
export function cavity(cd: number, bottom: number, height: number, wall: number): { top: number; bottom: number; depth: number } | NoValue {
  const top = cd - 2 * wall;
  const depth = height - wall;
  if (top <= 0) return noValue('the wall is at least half the CD: the cylinder has no cavity');
  if (depth <= 0) return noValue('the wall is at least as thick as the cylinder is tall');
  const floor = bottom + ((cd - bottom) * wall) / height - 2 * wall;
  // Stryker disable next-line EqualityOperator: at floor = 0 both branches give the same cup (bottom 0, depth·top/top = depth, to one rounding).
  if (floor > 0) return { top, bottom: floor, depth };
  // Linear narrowing from `top` at the rim to `floor` at `depth` reaches zero at depth·top/(top − floor).
  return { top, bottom: 0, depth: (depth * top) / (top - floor) };
}

/** Area of one array cell, per structure: p² (square), (√3/2)p² (hexagonal), p per unit length (lines). */
function cellFormula(shape: Shape): { tex: string; area: (p: number) => number } | null {
  if (isElongated(shape.kind)) return { tex: 'p', area: (p) => p };
  if (shape.array === 'square') return { tex: 'p^2', area: (p) => p * p };
  if (shape.array === 'hexagonal') return { tex: '\\tfrac{\\sqrt{3}}{2}p^2', area: (p) => (Math.sqrt(3) / 2) * p * p };
  return null;
}

const aspectRatio: QuantityDef = {
  name: 'geometry.aspect_ratio',
  title: 'Aspect ratio',
  unit: '1',
  symbol: '\\mathrm{AR}',
  description: 'Depth of an opening, or height of a standing structure, over its top critical dimension.',
  source: 'Definition in common use for high-aspect-ratio features (depth or height over top CD)',
  better: 'lower',
  variant: (shape) =>
    variant({
      inputs: { extent: extentInput(shape), cd: 'geometry.cd' },
      symbols: { extent: extentSymbol(shape), cd: '\\mathrm{CD}' },
      formula: `\\mathrm{AR} = \\frac{${extentSymbol(shape)}}{\\mathrm{CD}}`,
      compute: ({ extent, cd }) => extent / cd,
    }),
};

const bottomCdQ: QuantityDef = {
  name: 'geometry.bottom_cd',
  title: 'Bottom critical dimension',
  unit: 'm',
  symbol: '\\mathrm{CD}_b',
  description: 'Critical dimension at the bottom of an opening or the base of a standing structure, for a straight sidewall.',
  source: ELEMENTARY,
  assumptions: ['Straight (linear) sidewall from top to bottom.'],
  sweep: { input: extentInput, from: 0.25, to: 2 },
  variant: (shape) => {
    const opening = isOpening(shape.kind);
    const e = extentSymbol(shape);
    return variant({
      inputs: { cd: 'geometry.cd', extent: extentInput(shape), angle: 'geometry.sidewall_angle' },
      symbols: { cd: '\\mathrm{CD}', extent: e, angle: '\\theta' },
      formula: `\\mathrm{CD}_b = \\mathrm{CD} ${opening ? '-' : '+'} 2${e}\\cot\\theta`,
      compute: ({ cd, extent, angle }) => {
        const b = bottomCd(cd, extent, angle, opening);
        if (b <= 0) {
          return noValue(opening ? 'the tapered opening closes before it reaches its bottom' : 'the re-entrant body narrows to nothing before its base');
        }
        return b;
      },
    });
  },
};

const bottomToTop: QuantityDef = {
  name: 'geometry.bottom_to_top_ratio',
  title: 'Bottom-to-top CD ratio',
  unit: '1',
  symbol: '\\mathrm{CD}_b/\\mathrm{CD}',
  description: 'Bottom critical dimension over top critical dimension: 1 for vertical walls, below 1 for an opening that narrows.',
  source: ELEMENTARY,
  better: 'higher',
  variant: () =>
    variant({
      inputs: { bottom: 'geometry.bottom_cd', cd: 'geometry.cd' },
      symbols: { bottom: '\\mathrm{CD}_b', cd: '\\mathrm{CD}' },
      formula: 'r = \\frac{\\mathrm{CD}_b}{\\mathrm{CD}}',
      compute: ({ bottom, cd }) => bottom / cd,
    }),
};

const closureDepth: QuantityDef = {
  name: 'geometry.closure_depth',
  title: 'Closure depth of a tapered opening',
  unit: 'm',
  symbol: 'D_c',
  description: 'Depth at which a straight tapered opening narrows to zero width; an opening whose target depth exceeds it never reaches its bottom.',
  source: ELEMENTARY,
  assumptions: ['Straight sidewall; the taper continues at the same angle below the target depth.'],
  better: 'higher',
  variant: (shape) => {
    if (!isOpening(shape.kind)) return { notApplicable: 'only openings close as they deepen' };
    return variant({
      inputs: { cd: 'geometry.cd', angle: 'geometry.sidewall_angle' },
      symbols: { cd: '\\mathrm{CD}', angle: '\\theta' },
      formula: 'D_c = \\frac{\\mathrm{CD}}{2}\\tan\\theta',
      // D_c = (CD/2)·tan θ = CD/(2 cot θ), with the same notion of "vertical" as the bottom CD.
      compute: ({ cd, angle }) => {
        const cot = cotangent(angle);
        return cot <= 0 ? noValue('vertical or re-entrant sidewalls never close', 'above') : cd / (2 * cot);
      },
    });
  },
};

const space: QuantityDef = {
  name: 'geometry.space',
  title: 'Space to the nearest neighbour',
  unit: 'm',
  symbol: 's',
  description: 'Gap between neighbouring structures (standing kinds) or solid left between neighbouring openings, at the narrowest height: pitch minus the larger of top and bottom CD.',
  source: `${ELEMENTARY}; nearest neighbours sit one pitch apart in line, square and hexagonal arrays`,
  assumptions: ['Straight sidewall; an opening that closes above its bottom is widest at its top.'],
  better: 'higher',
  variant: (shape) => {
    const opening = isOpening(shape.kind);
    const e = extentSymbol(shape);
    return variant({
      inputs: { pitch: 'geometry.pitch', cd: 'geometry.cd', extent: extentInput(shape), angle: 'geometry.sidewall_angle' },
      symbols: { pitch: 'p', cd: '\\mathrm{CD}', extent: e, angle: '\\theta' },
      formula: `s = p - \\max\\left(\\mathrm{CD},\\; \\mathrm{CD} ${opening ? '-' : '+'} 2${e}\\cot\\theta\\right)`,
      compute: ({ pitch, cd, extent, angle }) => {
        // The straight-wall bottom CD may be negative (the opening closes first): then the top is widest.
        const s = pitch - Math.max(cd, bottomCd(cd, extent, angle, opening));
        return s > 0 ? s : noValue('neighbours touch or overlap: the pitch is not larger than the widest CD');
      },
    });
  },
};

const openArea: QuantityDef = {
  name: 'geometry.open_area_fraction',
  title: 'Open-area fraction',
  unit: '1',
  symbol: 'f_{open}',
  description: 'Fraction of the array area open at the top surface: the openings themselves, or the space around standing structures (and inside hollow cylinders).',
  source: `${ELEMENTARY}; unit cells p² (square), (√3/2)p² (hexagonal), p per unit length (lines)`,
  variant: (shape) => {
    const cell = cellFormula(shape);
    if (!cell) return { incomplete: ['geometry.array'] };
    const opening = isOpening(shape.kind);
    const elongated = isElongated(shape.kind);
    const hollow = shape.kind === 'cylinder';
    const inputs: Record<string, string> = { cd: 'geometry.cd', pitch: 'geometry.pitch' };
    if (hollow) inputs.wall = 'geometry.wall';
    const footprintTex = elongated ? '\\mathrm{CD}' : hollow ? '\\tfrac{\\pi}{4}\\left(\\mathrm{CD}^2 - (\\mathrm{CD}-2t_w)^2\\right)' : '\\tfrac{\\pi}{4}\\mathrm{CD}^2';
    return variant({
      label: `${shape.kind}, ${elongated ? 'lines' : shape.array} array`,
      inputs,
      symbols: { cd: '\\mathrm{CD}', pitch: 'p', wall: 't_w' },
      formula: opening ? `f_{open} = \\frac{${footprintTex}}{${cell.tex}}` : `f_{open} = 1 - \\frac{${footprintTex}}{${cell.tex}}`,
      compute: (a: Record<string, number>) => {
        const cd = a.cd!;
        const p = a.pitch!;
        if (hollow && cd - 2 * a.wall! <= 0) return noValue('the wall is at least half the CD: the cylinder has no cavity');
        const footprint = elongated ? cd : hollow ? (Math.PI / 4) * (cd * cd - (cd - 2 * a.wall!) ** 2) : (Math.PI / 4) * cd * cd;
        if (cd > p) return noValue('neighbours overlap: the CD is larger than the pitch');
        const f = footprint / cell.area(p);
        return opening ? f : 1 - f;
      },
    });
  },
};

const sidewallArea: QuantityDef = {
  name: 'geometry.sidewall_area',
  title: 'Sidewall area',
  unit: 'm^2',
  symbol: 'A_{sw}',
  description: 'Area of the sidewalls of one structure: the frustum surface of a hole, via or pillar; both faces of a trench or line over its length (end walls left out: length ≫ CD); outer and inner faces of a hollow cylinder.',
  source: `${ELEMENTARY}; frustum lateral area π(r₁ + r₂)·s with slant s`,
  variant: (shape) => {
    const e = extentSymbol(shape);
    const slant = `\\sqrt{${e}^2 + \\left(\\tfrac{\\mathrm{CD}-\\mathrm{CD}_b}{2}\\right)^2}`;
    const base = { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', extent: extentInput(shape) };
    const symbols = { cd: '\\mathrm{CD}', bottom: '\\mathrm{CD}_b', extent: e, length: 'L', wall: 't_w' };
    if (isElongated(shape.kind)) {
      return variant({
        inputs: { ...base, length: 'geometry.length' },
        symbols,
        formula: `A_{sw} = 2L${slant}`,
        compute: ({ cd, bottom, extent, length }) => 2 * length * Math.hypot(extent, (cd - bottom) / 2),
      });
    }
    if (shape.kind === 'cylinder') {
      return variant({
        inputs: { ...base, wall: 'geometry.wall' },
        symbols,
        formula: `A_{sw} = \\tfrac{\\pi}{2}(\\mathrm{CD}+\\mathrm{CD}_b)s + \\tfrac{\\pi}{2}(d_i+d_{ib})s_i,\\; s = ${slant},\\; s_i = \\sqrt{(${e}-t_w)^2 + \\left(\\tfrac{d_i-d_{ib}}{2}\\right)^2},\\; d_i = \\mathrm{CD}-2t_w,\\; d_{ib} = \\mathrm{CD}_b + (\\mathrm{CD}-\\mathrm{CD}_b)\\tfrac{t_w}{${e}} - 2t_w`,
        compute: ({ cd, bottom, extent, wall }) => {
          const c = cavity(cd, bottom, extent, wall);
          return 'reason' in c ? c : frustumLateralArea(cd, bottom, extent) + frustumLateralArea(c.top, c.bottom, c.depth);
        },
      });
    }
    return variant({
      inputs: base,
      symbols,
      formula: `A_{sw} = \\tfrac{\\pi}{2}(\\mathrm{CD}+\\mathrm{CD}_b)${slant}`,
      compute: ({ cd, bottom, extent }) => frustumLateralArea(cd, bottom, extent),
    });
  },
};

const volume: QuantityDef = {
  name: 'geometry.volume',
  title: 'Volume',
  unit: 'm^3',
  symbol: 'V',
  description: 'Volume of one opening (what a fill must close), or of the solid body of one standing structure (a hollow cylinder without its cavity).',
  source: `${ELEMENTARY}; frustum volume πh(d₁² + d₁d₂ + d₂²)/12`,
  assumptions: ['A hollow cylinder is a cup: its cavity reaches down to a bottom plate as thick as its wall, and the wall keeps its thickness, measured horizontally, along the taper. A cavity that narrows to nothing above its floor is a cone.'],
  variant: (shape) => {
    const e = extentSymbol(shape);
    const base = { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', extent: extentInput(shape) };
    const symbols = { cd: '\\mathrm{CD}', bottom: '\\mathrm{CD}_b', extent: e, length: 'L', wall: 't_w' };
    if (isElongated(shape.kind)) {
      return variant({
        inputs: { ...base, length: 'geometry.length' },
        symbols,
        formula: `V = L\\,${e}\\,\\frac{\\mathrm{CD}+\\mathrm{CD}_b}{2}`,
        compute: ({ cd, bottom, extent, length }) => (length * extent * (cd + bottom)) / 2,
      });
    }
    if (shape.kind === 'cylinder') {
      return variant({
        inputs: { ...base, wall: 'geometry.wall' },
        symbols,
        formula: `V = \\tfrac{\\pi ${e}}{12}(\\mathrm{CD}^2+\\mathrm{CD}\\,\\mathrm{CD}_b+\\mathrm{CD}_b^2) - \\tfrac{\\pi (${e}-t_w)}{12}(d_i^2+d_i d_{ib}+d_{ib}^2),\\; d_i = \\mathrm{CD}-2t_w,\\; d_{ib} = \\mathrm{CD}_b + (\\mathrm{CD}-\\mathrm{CD}_b)\\tfrac{t_w}{${e}} - 2t_w`,
        compute: ({ cd, bottom, extent, wall }) => {
          const c = cavity(cd, bottom, extent, wall);
          return 'reason' in c ? c : frustumVolume(cd, bottom, extent) - frustumVolume(c.top, c.bottom, c.depth);
        },
      });
    }
    return variant({
      inputs: base,
      symbols,
      formula: `V = \\tfrac{\\pi ${e}}{12}(\\mathrm{CD}^2+\\mathrm{CD}\\,\\mathrm{CD}_b+\\mathrm{CD}_b^2)`,
      compute: ({ cd, bottom, extent }) => frustumVolume(cd, bottom, extent),
    });
  },
};

export const geometryEngine: Engine = {
  id: 'geometry',
  title: 'Geometry',
  summary: 'Aspect ratio, taper, spacing, open area, areas and volumes from the declared geometry.',
  quantities: [aspectRatio, bottomCdQ, bottomToTop, closureDepth, space, openArea, sidewallArea, volume],
};
