// Thermo-mechanical stress: the field a via leaves in the silicon after an anneal, the mobility
// shift it causes in nearby transistors and the keep-out radius that bounds it, and the bow a
// stressed film gives the wafer.
//
// Via: an elastic cylinder (1) in an infinite elastic matrix (2), plane strain, uniform
// temperature change [derived; the classical shrink-fit/inclusion solution, Timoshenko & Goodier,
// Theory of Elasticity]: in the matrix σ_rr = −σ_θθ = σ₀(a/r)² with
// σ₀ = −[k₁m₂/(k₁ + m₂)]·[(1 + ν₁)α₁ − (1 + ν₂)α₂]·ΔT, k₁ = E₁/((1 + ν₁)(1 − 2ν₁)), m₂ = E₂/(1 + ν₂).
// Both materials are isotropic here, so the substrate enters through its isotropic stand-in
// (`isotropic_youngs_modulus`, `isotropic_poisson_ratio`; for silicon the Voigt–Reuss–Hill average).
// Mobility: Δμ/μ = −P(N, T)·(π_L·σ_L + π_T·σ_T) with Smith's piezoresistance coefficients (Phys. Rev.
// 94, 42 (1954)) rotated to ⟨110⟩ and scaled by the doping and temperature factor P(N, T) (Kanda,
// IEEE Trans. Electron Devices 29, 64 (1982)); around the via σ_L − σ_T follows σ_rr·cos 2φ, so the
// largest shift at distance r is P·|π_L − π_T|·|σ₀|(a/r)².
// Bow: Stoney's equation with the substrate's biaxial modulus (Freund & Suresh, Thin Film
// Materials, 2003): κ = 6σ_f·h_f/(M_s·h_s²), bow b = κ·R²/2 over a wafer of radius R.
import { noValue, variant, type Engine, type Figure, type QuantityDef, type Shape, type ValidityCheck } from '../quantity.ts';

/** Smith (1954), 1e-11 /Pa: n- and p-type silicon, lightly doped, at room temperature. */
export const SMITH = {
  n: { p11: -102.2e-11, p12: 53.4e-11, p44: -13.6e-11 },
  p: { p11: 6.6e-11, p12: -1.1e-11, p44: 138.1e-11 },
} as const;

export type Channel = 'n100' | 'n110' | 'p100' | 'p110';

/** Longitudinal and transverse coefficients of a channel in the (001) plane (Kanda 1982). */
export function piezo(channel: Channel): { longitudinal: number; transverse: number } {
  const c = SMITH[channel[0] as 'n' | 'p'];
  if (channel.endsWith('100')) return { longitudinal: c.p11, transverse: c.p12 };
  return { longitudinal: (c.p11 + c.p12 + c.p44) / 2, transverse: (c.p11 + c.p12 - c.p44) / 2 };
}

/**
 * Fit of P(N, T) for p-type silicon by Richter, Pedersen & Thomsen, J. Appl. Phys. 104, 023715
 * (2008), N in cm⁻³, Θ = T/300 K: P = Θ^−θ / [1 + Θ^−β (N/N_b)^α + Θ^−η (N/N_c)^γ] (constants as
 * transcribed in the PiezoD cantilever code, github.com/MicrosystemsLab/PiezoD).
 */
const RICHTER = { nb: 6e19, nc: 7e20, alpha: 0.43, gamma: 1.6, beta: 0.1, eta: 3, theta: 0.9 } as const;

/**
 * Kanda's piezoresistance factor P(N, T) for the coefficient difference a channel sees
 * (|π_L − π_T|; N in m⁻³, T in K). p-type: Richter's fit (π44 sets ⟨110⟩; the small ⟨100⟩ pair is
 * scaled alike, as Kanda does). n-type ⟨100⟩: π11 − π12 comes from valley repopulation, ∝ 1/kT in
 * the nondegenerate limit of Kanda's factor, so P = 300 K/T. n-type ⟨110⟩: π44, which is nearly
 * independent of doping and temperature below 1e20 cm⁻³ (Kanda & Matsuda, AIP Conf. Proc. 893, 173
 * (2007)), so P = 1.
 */
export function piezoFactor(channel: Channel, doping: number, temperature: number): number {
  const theta = temperature / 300;
  if (channel === 'n100') return 1 / theta;
  if (channel === 'n110') return 1;
  const n = doping * 1e-6;
  const r = RICHTER;
  return theta ** -r.theta / (1 + theta ** -r.beta * (n / r.nb) ** r.alpha + theta ** -r.eta * (n / r.nc) ** r.gamma);
}

/** TeX of the factor each channel uses (N in cm⁻³ in the p-type fit). */
const RICHTER_TEX = 'P = \\frac{\\Theta^{-0.9}}{1 + \\Theta^{-0.1}(N/6\\times10^{19})^{0.43} + \\Theta^{-3}(N/7\\times10^{20})^{1.6}},\\; \\Theta = \\frac{T}{300\\,\\mathrm{K}}';
const FACTOR_TEX: Record<Channel, string> = { n100: 'P = \\frac{300\\,\\mathrm{K}}{T}', n110: 'P = 1', p100: RICHTER_TEX, p110: RICHTER_TEX };

/** Doping (m⁻³) up to which each channel's factor holds: light doping for the nondegenerate n-type limit. */
const FACTOR_MAX_DOPING: Record<Channel, { max: number; why: string }> = {
  n100: { max: 1e23, why: 'above 1e17 cm⁻³ degeneracy and impurity scattering lower the n-type π11 − π12 below its light-doping value: the shift and keep-out radius are overstated (conservative).' },
  n110: { max: 1e26, why: 'above 1e20 cm⁻³ the n-type π44 changes with doping (band tail): outside the range of the factor.' },
  p100: { max: 1e26, why: 'above 1e20 cm⁻³ lies outside the range of the p-type fit of P(N, T).' },
  p110: { max: 1e26, why: 'above 1e20 cm⁻³ lies outside the range of the p-type fit of P(N, T).' },
};

/** Stress at the via edge in the matrix, σ₀ (radial; hoop is −σ₀). */
export function viaEdgeStress(e1: number, nu1: number, a1: number, e2: number, nu2: number, a2: number, dT: number): number {
  const k1 = e1 / ((1 + nu1) * (1 - 2 * nu1));
  const m2 = e2 / (1 + nu2);
  return -((k1 * m2) / (k1 + m2)) * ((1 + nu1) * a1 - (1 + nu2) * a2) * dT;
}

/** Radial and hoop stress in the matrix at distance r from the centre of a via of radius a. */
export function matrixStress(s0: number, a: number, r: number): { radial: number; hoop: number } {
  const f = (a / r) ** 2;
  return { radial: s0 * f, hoop: -s0 * f };
}

/**
 * Relative mobility change of a channel at (x, y) from the via centre, channel along x, with the
 * piezoresistance factor P: with σ_L = σ_rr cos²φ + σ_θθ sin²φ = σ₀(a/r)² cos 2φ and σ_T = −σ_L,
 * Δμ/μ = −P·(π_L − π_T)·σ₀(a/r)²·cos 2φ.
 */
export function mobilityShiftAt(channel: Channel, factor: number, s0: number, a: number, x: number, y: number): number {
  const { longitudinal, transverse } = piezo(channel);
  const r2 = x * x + y * y;
  const cos2phi = (x * x - y * y) / r2;
  return -factor * (longitudinal - transverse) * s0 * ((a * a) / r2) * cos2phi;
}

function stressProfile(s0: number, a: number): Figure {
  const points = [];
  for (let i = 0; i <= 60; i++) {
    const r = a * (1 + (9 * i) / 60);
    points.push({ r, ...matrixStress(s0, a, r) });
  }
  return { type: 'stress-profile', radius: a, points };
}

function mobilityMap(channel: Channel, factor: number, s0: number, a: number, keepOut: number, threshold: number): Figure {
  const n = 41;
  const extent = 1.5 * Math.max(keepOut, 2 * a);
  const values: Array<number | null> = [];
  for (let j = 0; j < n; j++) {
    const y = extent - ((j + 0.5) * 2 * extent) / n;
    for (let i = 0; i < n; i++) {
      const x = -extent + ((i + 0.5) * 2 * extent) / n;
      // Stryker disable next-line EqualityOperator: no cell centre lies exactly on the via's edge
      values.push(x * x + y * y <= a * a ? null : mobilityShiftAt(channel, factor, s0, a, x, y));
    }
  }
  return { type: 'mobility-map', channel: `${channel[0]}-channel ⟨${channel.slice(1)}⟩`, radius: a, keepOut, threshold, extent, n, values };
}

/** Biaxial modulus of a silicon wafer from its elastic constants (Hopcroft, Nix & Kenny 2010: C11 165.7, C12 63.9, C44 79.6 GPa). */
export function siliconBiaxialModulus(orientation: '001' | '111'): number {
  const [c11, c12, c44] = [165.7e9, 63.9e9, 79.6e9];
  if (orientation === '001') return c11 + c12 - (2 * c12 * c12) / c11;
  // (111): M = 6·C44·(C11 + 2C12)/(C11 + 2C12 + 4C44).
  return (6 * c44 * (c11 + 2 * c12)) / (c11 + 2 * c12 + 4 * c44);
}

const INCLUSION = 'Elastic cylinder in an elastic matrix, plane strain (classical inclusion solution, Timoshenko & Goodier, Theory of Elasticity); σ₀ = −[k₁m₂/(k₁ + m₂)][(1 + ν₁)α₁ − (1 + ν₂)α₂]ΔT';
const PIEZO =
  'Smith, Phys. Rev. 94, 42 (1954), piezoresistance of lightly doped silicon; rotated to ⟨110⟩ and scaled by the doping and temperature factor P(N, T) as in Kanda, IEEE Trans. Electron Devices 29, 64 (1982): p-type by the fit of Richter, Pedersen & Thomsen, J. Appl. Phys. 104, 023715 (2008); n-type ⟨100⟩ by its nondegenerate limit 300 K/T; n-type ⟨110⟩ (π44) unscaled, after Kanda & Matsuda, AIP Conf. Proc. 893, 173 (2007); Δμ/μ ≈ −P(π_L σ_L + π_T σ_T)';

/** The substrate is the inclusion model's isotropic matrix: it reads the substrate's isotropic stand-in. */
const stressInputs = {
  e1: 'via.conductor_youngs_modulus',
  nu1: 'via.conductor_poisson_ratio',
  a1: 'via.conductor_thermal_expansion',
  e2: 'materials.substrate.isotropic_youngs_modulus',
  nu2: 'materials.substrate.isotropic_poisson_ratio',
  a2: 'materials.substrate.thermal_expansion',
  dT: 'anneal.temperature_change',
};
const ISOTROPIC_SUBSTRATE =
  'The substrate enters as an isotropic matrix through its isotropic stand-in (materials.substrate.isotropic_youngs_modulus and isotropic_poisson_ratio; an isotropic material’s own pair): for single-crystal silicon the materials table gives the Voigt–Reuss–Hill average of its cubic constants, 162.7 GPa and 0.223, with which the edge stress of a copper via lies about 4 % above the anisotropic (001) solution (the (001) pair 130 GPa/0.28 quoted in via papers gives about 14 % less). In the crystal the hoop stress and the field away from the edge also vary with the angle around the via; that is not modelled.';
const SYMBOLS: Record<string, string> = {
  e1: 'E_1',
  nu1: '\\nu_1',
  a1: '\\alpha_1',
  e2: 'E_2',
  nu2: '\\nu_2',
  a2: '\\alpha_2',
  dT: '\\Delta T',
  s0: '\\sigma_0',
  cd: '\\mathrm{CD}',
  depth: 'h',
  limit: '\\Delta\\mu_{max}',
  doping: 'N',
  temperature: 'T',
  stress: '\\sigma_f',
  hf: 'h_f',
  hs: 'h_s',
  d: 'D_w',
  bow: 'b',
  blimit: 'b_{max}',
};

function viaOnly(shape: Shape): { notApplicable: string } | null {
  return shape.kind === 'via' ? null : { notApplicable: 'the via stress field concerns through-silicon vias' };
}

const viaStress: QuantityDef = {
  name: 'thermomech.via_stress',
  title: 'Radial stress in the silicon at the via edge',
  unit: 'Pa',
  symbol: '\\sigma_0',
  description: 'Radial stress in the silicon at the conductor’s edge after the temperature change (tensile positive); the hoop stress is its negative, and both fall as (a/r)².',
  source: INCLUSION,
  assumptions: [
    'Plane strain far below the wafer surface (near the surface the field is three-dimensional); isotropic elastic materials; the thin liner is left out.',
    ISOTROPIC_SUBSTRATE,
    'The single-modulus form −EΔαΔT/2 quoted in some via papers differs from this two-material solution by up to about 1.5×.',
  ],
  validity: [
    { holds: ({ depth, cd }) => depth! >= 3 * cd!, why: 'plane strain needs a via at least three diameters deep; a shallower via relaxes at the surface and the field is smaller.' },
  ],
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { ...stressInputs, cd: 'geometry.cd', depth: 'geometry.depth' },
      symbols: SYMBOLS,
      formula: '\\sigma_0 = -\\frac{k_1 m_2}{k_1 + m_2}\\left[(1+\\nu_1)\\alpha_1 - (1+\\nu_2)\\alpha_2\\right]\\Delta T,\\;\\; k_1 = \\frac{E_1}{(1+\\nu_1)(1-2\\nu_1)},\\; m_2 = \\frac{E_2}{1+\\nu_2}',
      compute: ({ e1, nu1, a1, e2, nu2, a2, dT, cd }) => {
        const s0 = viaEdgeStress(e1, nu1, a1, e2, nu2, a2, dT);
        return { value: s0, note: 'hoop stress −σ₀; both fall off as (a/r)²', figure: stressProfile(s0, cd / 2) };
      },
    }),
};

/** Where the factor P(N, T) holds, on the channel doping and temperature. */
function factorValidity(channel: Channel): ValidityCheck[] {
  const doping = FACTOR_MAX_DOPING[channel];
  return [
    { arg: 'doping', max: doping.max, why: doping.why },
    { arg: 'temperature', min: 200, max: 400, why: 'the piezoresistance factor holds near room temperature (about 200–400 K, a range recalled rather than read from the fit’s paper); outside it the shift is an extrapolation.' },
  ];
}

function channelQuantities(channel: Channel): QuantityDef[] {
  const { longitudinal, transverse } = piezo(channel);
  const diff = Math.abs(longitudinal - transverse);
  const label = `${channel[0]}-type channel along ⟨${channel.slice(1)}⟩`;
  const factorInputs = { doping: 'keep_out.channel_doping', temperature: 'keep_out.temperature' };
  /** The largest shift at the via edge, P·|π_L − π_T|·|σ₀|. */
  const edgeShift = (s0: number, doping: number, temperature: number) => piezoFactor(channel, doping, temperature) * diff * Math.abs(s0);
  const factorTex = `${FACTOR_TEX[channel]},\\;\\; |\\pi_L - \\pi_T| = ${(diff * 1e11).toFixed(1)}\\times 10^{-11}\\,\\mathrm{Pa^{-1}}`;
  const assumptions = [
    'Bulk piezoresistance of silicon at the channel’s doping and temperature, applied to the carrier mobility; an inversion layer’s coefficients differ.',
    'Linear piezoresistance (small shifts); stress in the (001) plane only.',
  ];
  const shift: QuantityDef = {
    name: `thermomech.mobility_shift_${channel}`,
    title: `Mobility shift at the via edge, ${label}`,
    unit: '1',
    symbol: `|\\Delta\\mu/\\mu|_{${channel}}`,
    description: `Largest relative mobility change of a ${label} at the via edge, over every angle around the via.`,
    source: PIEZO,
    assumptions,
    validity: [
      // Stryker disable next-line EqualityOperator: a shift of exactly 20 % is not a case
      { holds: ({ s0, doping, temperature }) => edgeShift(s0!, doping!, temperature!) <= 0.2, why: 'above a 20 % shift the linear piezoresistance model no longer holds.' },
      ...factorValidity(channel),
    ],
    better: 'lower',
    variant: (shape) =>
      viaOnly(shape) ??
      variant({
        inputs: { s0: 'thermomech.via_stress', ...factorInputs },
        symbols: SYMBOLS,
        formula: `\\left|\\frac{\\Delta\\mu}{\\mu}\\right| = P\\,|\\pi_L - \\pi_T|\\,|\\sigma_0| ,\\;\\; ${factorTex}`,
        compute: ({ s0, doping, temperature }) => edgeShift(s0, doping, temperature),
      }),
  };
  const koz: QuantityDef = {
    name: `thermomech.keep_out_radius_${channel}`,
    title: `Keep-out radius, ${label}`,
    unit: 'm',
    symbol: `r_{koz,${channel}}`,
    description: `Distance from the via centre beyond which a ${label} shifts less than the threshold in every direction (the via radius when it never exceeds it).`,
    source: `${INCLUSION}; ${PIEZO}`,
    assumptions: ['Single via in an infinite matrix: neighbouring vias’ fields add and widen the zone between them.', ...assumptions],
    validity: [{ arg: 'limit', max: 0.2, why: 'a threshold above 20 % lies outside the linear piezoresistance model.' }, ...factorValidity(channel)],
    better: 'lower',
    variant: (shape) =>
      viaOnly(shape) ??
      variant({
        inputs: { s0: 'thermomech.via_stress', cd: 'geometry.cd', limit: 'keep_out.mobility_shift', ...factorInputs },
        symbols: SYMBOLS,
        formula: `r_{koz} = \\max\\left(\\frac{\\mathrm{CD}}{2},\\; \\frac{\\mathrm{CD}}{2}\\sqrt{\\frac{P\\,|\\pi_L - \\pi_T|\\,|\\sigma_0|}{\\Delta\\mu_{max}}}\\right),\\;\\; ${factorTex}`,
        compute: ({ s0, cd, limit, doping, temperature }) => {
          const a = cd / 2;
          const r = a * Math.sqrt(edgeShift(s0, doping, temperature) / limit);
          const koz = Math.max(r, a);
          return {
            value: koz,
            // Stryker disable next-line EqualityOperator: at r = a exactly the two notes are both true
            note: r <= a ? 'the shift stays under the threshold everywhere outside the via' : 'set along and across the channel (cos 2φ = ±1), where the shift is largest',
            figure: mobilityMap(channel, piezoFactor(channel, doping, temperature), s0, a, koz, limit),
          };
        },
      }),
  };
  return [shift, koz];
}

/**
 * Axial rise of a conductor that slides freely along its liner (σ_zz = 0 in it) while the silicon
 * holds it radially: with the in-plane pressure of the inclusion solution under σ_zz = 0,
 * σ_in = −(α₁ − α₂)ΔT/[(1 − ν₁)/E₁ + (1 + ν₂)/E₂], the conductor's extra axial strain is
 * (α₁ − α₂)ΔT − 2ν₁σ_in/E₁ [derived from the same inclusion solution].
 */
export function freeSlidingProtrusion(e1: number, nu1: number, a1: number, e2: number, nu2: number, a2: number, dT: number, depth: number): number {
  const poisson = (2 * nu1) / e1 / ((1 - nu1) / e1 + (1 + nu2) / e2);
  return (a1 - a2) * Math.abs(dT) * depth * (1 + poisson);
}

const protrusion: QuantityDef = {
  name: 'thermomech.protrusion',
  title: 'Conductor protrusion during the anneal',
  unit: 'm',
  symbol: '\\Delta h',
  description: 'How far the conductor rises above the silicon surface at the anneal temperature if it slides freely along the liner while the silicon holds it radially: the expansion mismatch over the via depth plus the Poisson push of the radial pressure. Part of it stays after cooling where the conductor yields near the top.',
  source: 'Elastic estimate derived from the cylinder-in-a-matrix solution (Timoshenko & Goodier, Theory of Elasticity) with a freely sliding conductor (σ_zz = 0); measured protrusions to compare with: Heryanto et al., J. Electron. Mater. (2012), doi:10.1007/s11664-012-2117-3',
  assumptions: [
    'Elastic, with the liner letting the conductor slide; plastic flow near the top, grain growth and the liner’s shear hold change the measured value either way.',
    ISOTROPIC_SUBSTRATE,
    'The anneal excursion is the size of the stated temperature change; a negative value means the conductor sinks below the surface.',
  ],
  better: 'lower',
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { ...stressInputs, depth: 'geometry.depth' },
      symbols: SYMBOLS,
      formula: '\\Delta h = (\\alpha_1 - \\alpha_2)\\,|\\Delta T|\\,h\\left[1 + \\frac{2\\nu_1/E_1}{(1-\\nu_1)/E_1 + (1+\\nu_2)/E_2}\\right]',
      compute: ({ e1, nu1, a1, e2, nu2, a2, dT, depth }) => freeSlidingProtrusion(e1, nu1, a1, e2, nu2, a2, dT, depth),
    }),
};

const waferBow: QuantityDef = {
  name: 'thermomech.wafer_bow',
  title: 'Wafer bow',
  unit: 'm',
  symbol: 'b',
  description: 'Bow (centre height) of the wafer under the film’s stress, from Stoney’s equation with the substrate’s biaxial modulus.',
  source: 'Stoney (1909) in biaxial form, Freund & Suresh, Thin Film Materials (2003): κ = 6σ_f h_f/(M_s h_s²), b = κR²/2; M_s of silicon from Hopcroft, Nix & Kenny (2010)',
  assumptions: ['Film much thinner than the wafer; small deflection; uniform film over the whole wafer.'],
  // Stryker disable next-line EqualityOperator: a film of exactly 1 % of the wafer is not a case
  validity: [{ holds: ({ hf, hs }) => hf! < 0.01 * hs!, why: 'Stoney’s equation needs a film under about 1 % of the wafer thickness.' }],
  better: 'lower',
  variant: (shape) =>
    variant({
      inputs: { stress: 'film.stress', hf: 'film.thickness', hs: 'wafer.thickness', d: 'wafer.diameter' },
      symbols: SYMBOLS,
      formula: `b = \\frac{3\\,\\sigma_f h_f R^2}{M_s h_s^2},\\;\\; R = \\frac{D_w}{2},\\;\\; M_s(${shape.waferOrientation ?? '001'}) = ${(siliconBiaxialModulus(shape.waferOrientation ?? '001') / 1e9).toFixed(1)}\\,\\mathrm{GPa}`,
      compute: ({ stress, hf, hs, d }) => {
        const m = siliconBiaxialModulus(shape.waferOrientation ?? '001');
        const kappa = (6 * stress * hf) / (m * hs * hs);
        return Math.abs((kappa * (d / 2) ** 2) / 2);
      },
    }),
};

const bowMargin: QuantityDef = {
  name: 'thermomech.bow_margin',
  title: 'Bow margin',
  unit: '1',
  symbol: 'b_{max}/b',
  description: 'Largest bow the next steps accept over the wafer’s bow: above 1 it passes.',
  source: 'b_max/b',
  better: 'higher',
  variant: () =>
    variant({
      inputs: { bow: 'thermomech.wafer_bow', blimit: 'wafer.bow_limit' },
      symbols: SYMBOLS,
      formula: '\\frac{b_{max}}{b}',
      compute: ({ bow, blimit }) => (bow === 0 ? noValue('no bow', 'above') : blimit / bow),
    }),
};

export const thermomechEngine: Engine = {
  id: 'thermomech',
  title: 'Thermo-mechanics: via stress, keep-out zones, wafer bow',
  summary: 'Stress a via leaves in the silicon after an anneal, the mobility shift of nearby n- and p-channels along ⟨100⟩ and ⟨110⟩ and the keep-out radius per channel, the conductor’s protrusion, and the bow a stressed film gives the wafer.',
  quantities: [viaStress, ...(['n100', 'n110', 'p100', 'p110'] as const).flatMap(channelQuantities), protrusion, waferBow, bowMargin],
};
