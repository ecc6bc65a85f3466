// How numbers are shown to people, in the CLI and on the site alike. Values stay SI everywhere
// else; only here are they scaled to a readable prefix (32 nm rather than 3.2e-8 m).

const PREFIXES: Array<[number, string]> = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
  [1e-18, 'a'],
];

/** Significant digits, without trailing zeros after the point. */
export function sig(x: number, digits = 4): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e5) {
    const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(a)));
    return trim(x.toFixed(Math.min(decimals, 10)));
  }
  const [m, e] = x.toExponential(digits - 1).split('e');
  return `${trim(m ?? '')}e${Number(e)}`;
}

function trim(s: string): string {
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
}

function withPrefix(value: number, unit: string, power = 1, digits = 4): string {
  const a = Math.abs(value);
  for (const [scale, p] of PREFIXES) {
    const s = scale ** power;
    // Areas and volumes read better as 0.24 µm² than as 242858 nm².
    const floor = power === 1 ? 0.9995 : 0.1;
    if (a >= s * floor || scale === 1e-18) {
      const sup = power === 2 ? '²' : power === 3 ? '³' : '';
      return `${sig(value / s, digits)} ${p}${unit}${sup}`;
    }
  }
  return `${sig(value, digits)} ${unit}`;
}

const DISPLAY: Record<string, (v: number, d: number) => string> = {
  '1': (v, d) => sig(v, d),
  m: (v, d) => withPrefix(v, 'm', 1, d),
  'm^2': (v, d) => withPrefix(v, 'm', 2, d),
  'm^3': (v, d) => withPrefix(v, 'm', 3, d),
  rad: (v, d) => `${sig((v * 180) / Math.PI, d + 1)}°`,
  F: (v, d) => withPrefix(v, 'F', 1, d),
  V: (v, d) => withPrefix(v, 'V', 1, d),
  Pa: (v, d) => withPrefix(v, 'Pa', 1, d),
  'N/m': (v, d) => `${sig(v * 1e3, d)} mN/m`,
  s: (v, d) => (Math.abs(v) >= 60 ? `${sig(v / 60, d)} min` : withPrefix(v, 's', 1, d)),
  'm/s': (v, d) => `${sig(v * 6e10, d)} nm/min`,
  '1/K': (v, d) => `${sig(v * 1e6, d)} ppm/K`,
  'ohm*m': (v, d) => `${sig(v * 1e8, d)} µΩ·cm`,
  K: (v, d) => `${sig(v, d)} K`,
  'Pa*s': (v, d) => withPrefix(v, 'Pa·s', 1, d),
  'kg/mol': (v, d) => `${sig(v * 1e3, d)} g/mol`,
  '1/m^2': (v, d) => `${sig(v, d)} m⁻²`,
  N: (v, d) => withPrefix(v, 'N', 1, d),
  ohm: (v, d) => withPrefix(v, 'Ω', 1, d),
  H: (v, d) => withPrefix(v, 'H', 1, d),
  A: (v, d) => withPrefix(v, 'A', 1, d),
  'V/m': (v, d) => `${sig(v / 1e8, d)} MV/cm`,
  '1/m^3': (v, d) => `${sig(v / 1e6, d)} cm⁻³`,
};

/** `3.2e-8, 'm'` → `32 nm`; dimensionless values are plain numbers. */
export function formatValue(value: number | null, unit: string, digits = 4): string {
  if (value === null) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '+∞' : value < 0 ? '−∞' : 'undefined';
  if (value === 0 && unit === 'rad') return '0°';
  if (value === 0 && unit !== '1') return `0 ${displayUnitOf(unit)}`;
  const f = DISPLAY[unit];
  return f ? f(value, digits) : `${sig(value, digits)} ${unit}`;
}

function displayUnitOf(unit: string): string {
  const base: Record<string, string> = { m: 'm', 'm^2': 'm²', 'm^3': 'm³', rad: '°', 'N/m': 'mN/m', 'm/s': 'nm/min', '1/K': 'ppm/K', 'ohm*m': 'µΩ·cm' };
  return base[unit] ?? unit;
}

/** Margin as a signed percentage. */
export function formatMargin(m: number | null): string {
  if (m === null || !Number.isFinite(m)) return '—';
  if (Math.abs(m) < 1e-9) return '0 %';
  const pct = m * 100;
  const s = Math.abs(pct) >= 1000 ? pct.toExponential(1) : sig(pct, 3);
  return `${pct >= 0 ? '+' : ''}${s} %`;
}

/** Unit as shown beside a value column. */
export function displayUnit(unit: string): string {
  return formatValue(1, unit).replace(/^[-\d.e]+\s*/, '') || '1';
}

/** A common display scale for a set of values of one unit (for chart axes): factor and label. */
export function displayScale(unit: string, typical: number): { factor: number; label: string } {
  if (unit === 'rad') return { factor: 180 / Math.PI, label: '°' };
  if (unit === '1') return { factor: 1, label: '' };
  if (typical === 0 || !Number.isFinite(typical)) return { factor: 1, label: unit };
  const shown = formatValue(typical, unit);
  const label = shown.replace(/^[-+]?[\d.]+(e[-+]?\d+)?\s*/, '');
  const number = Number(shown.split(/\s/)[0]);
  const factor = typical !== 0 && Number.isFinite(number) && number !== 0 ? number / typical : 1;
  return { factor, label };
}
