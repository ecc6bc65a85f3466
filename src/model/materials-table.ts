// Built-in materials. Values are written with units, like a handbook's own, and converted at load.
// Each value names its source: a published table or paper, a value derived from one (with the
// derivation), or — for process-dependent films — a typical value with its range, marked as such,
// so a handbook that depends on it overrides it with its own measured value.
//
// Single-crystal silicon is anisotropic, so it carries two kinds of elastic entries: the pair for
// load along the wafer normal of a (001) wafer (`youngs_modulus`, `poisson_ratio`: what a standing
// structure bends with), and an explicitly isotropic stand-in (`isotropic_youngs_modulus`,
// `isotropic_poisson_ratio`: what an isotropic model such as the via stress reads). An isotropic
// material has only the first pair, which the loader also hands to isotropic models.

export interface TableValue {
  value: string;
  source: string;
}

export interface TableMaterial {
  id: string;
  title: string;
  properties: Record<string, TableValue>;
}

const HOPCROFT = 'Hopcroft, Nix & Kenny, J. Microelectromech. Syst. 19, 229 (2010)';
const CUBIC = `${HOPCROFT}: C11 = 165.7, C12 = 63.9, C44 = 79.6 GPa`;
const VRH = `Voigt–Reuss–Hill average (Hill, Proc. Phys. Soc. A 65, 349 (1952)) of ${CUBIC}: K = 97.8 GPa, G = (68.1 + 65.0)/2 = 66.5 GPa`;
const ROBERTSON = 'Robertson, Eur. Phys. J. Appl. Phys. 28, 265 (2004), Table 1';
const OKADA = 'Okada & Tokumaru, J. Appl. Phys. 56, 314 (1984), fit evaluated at 293 K';
const CALCUTT = 'Calcutt, Introduction to Copper: Fact Sheets (2001), Table 5';
const TUNGSTEN = 'CRC Handbook of Chemistry and Physics, 97th ed., and Cardarelli, Materials Handbook (2018), as compiled at matmake.com (tungsten properties)';
const SILICA = 'fused silica: 73 GPa, ν 0.17, 0.5 µm/(m·K) in the makeitfrom.com compilation (Fused Silica)';
const PECVD = 'PECVD films by nanoindentation: oxide ≈ 53 GPa, nitride ≈ 150 GPa (J. Eur. Ceram. Soc. (2009), Michigan Tech)';
const FILM = 'typical thin-film value, process-dependent (override with your own data)';

export const BUILT_IN_MATERIALS: TableMaterial[] = [
  {
    id: 'silicon',
    title: 'Single-crystal silicon, (001) wafer',
    properties: {
      youngs_modulus: {
        value: '130.1 GPa',
        source: `${CUBIC}: E along ⟨100⟩ = 1/S11 (published 130 GPa), the wafer normal [001] along which a standing structure's bending stress runs (⟨110⟩ 169, ⟨111⟩ 188 GPa: a (111) wafer's bodies need 188)`,
      },
      poisson_ratio: {
        value: '0.278',
        source: `${CUBIC}: ν = −S12/S11 for load along ⟨100⟩, lateral strain along any direction normal to it (published 0.28); a line's plate modulus E/(1 − ν²) = 141.1 GPa is exact along ⟨100⟩ and 2.5 % under the 144.7 GPa along ⟨110⟩`,
      },
      isotropic_youngs_modulus: { value: '162.7 GPa', source: `isotropic stand-in for isotropic models (not the modulus of any direction): ${VRH}` },
      isotropic_poisson_ratio: { value: '0.223', source: `isotropic stand-in for isotropic models: ${VRH}` },
      thermal_expansion: { value: '2.509 ppm/K', source: OKADA },
      dielectric_constant: { value: '11.7', source: 'Sze & Ng, Physics of Semiconductor Devices, 3rd ed., Appendix (11.9 also quoted)' },
      fracture_strength: { value: '1 GPa', source: 'typical value, range about 0.5–5 GPa for etched silicon microstructures in bending, set by the surface finish (recalled range; measure your own)' },
    },
  },
  {
    id: 'polysilicon',
    title: 'Polycrystalline silicon',
    properties: {
      youngs_modulus: { value: '162.7 GPa', source: `random texture: ${VRH}; measured films typically 150–170 GPa (recalled range; texture-dependent)` },
      poisson_ratio: { value: '0.223', source: `random texture: ${VRH}` },
      thermal_expansion: { value: '2.509 ppm/K', source: `as single-crystal silicon (a cubic crystal expands isotropically): ${OKADA}` },
      dielectric_constant: { value: '11.7', source: 'as single-crystal silicon' },
      resistivity: { value: '1e-5 ohm*m', source: `${FILM}: heavily doped films typically 0.5–10 mΩ·cm (recalled range; doping-dependent)` },
    },
  },
  {
    id: 'silicon-dioxide',
    title: 'Silicon dioxide',
    properties: {
      youngs_modulus: { value: '70 GPa', source: `${FILM}: typical 53–73 GPa (${SILICA}; ${PECVD})` },
      poisson_ratio: { value: '0.17', source: `${FILM}: ${SILICA}` },
      thermal_expansion: { value: '0.5 ppm/K', source: `typical 0.5–0.55 ppm/K near room temperature (${SILICA}; 0.55 ppm/K mean over 20–320 °C widely quoted; reference material NIST SRM 739, Hahn & Kirby, AIP Conf. Proc. 3, 13 (1972))` },
      dielectric_constant: { value: '3.9', source: ROBERTSON },
    },
  },
  {
    id: 'silicon-nitride',
    title: 'Silicon nitride',
    properties: {
      youngs_modulus: { value: '250 GPa', source: `${FILM}: typical 150–300 GPa, LPCVD stoichiometric films at the top of the range (recalled), ${PECVD}` },
      poisson_ratio: { value: '0.23', source: `${FILM}: 0.23 ± 0.02 and 0.25 ± 0.01 measured by bulge test for low-temperature PECVD films ("Poisson's Ratio of Low-Temperature PECVD Silicon Nitride Thin Films", Univ. of Western Australia)` },
      thermal_expansion: { value: '3.3 ppm/K', source: `${FILM}: typical 2.3–3.3 ppm/K; 3.27 ppm/K measured for PECVD SiNx (Appl. Opt. 51, 7229 (2012))` },
      dielectric_constant: { value: '7', source: ROBERTSON },
    },
  },
  {
    id: 'titanium-nitride',
    title: 'Titanium nitride',
    properties: {
      youngs_modulus: { value: '400 GPa', source: `${FILM}: typical, films range 250–600 GPa (recalled range)` },
      poisson_ratio: { value: '0.25', source: `${FILM}: typical, about 0.2–0.3 (recalled range)` },
      thermal_expansion: { value: '9.4 ppm/K', source: `${FILM}: typical, about 8–9.5 ppm/K (recalled range)` },
      resistivity: { value: '1e-6 ohm*m', source: `${FILM}: typical, 20–200 µΩ·cm by process (recalled range)` },
      fracture_strength: { value: '3 GPa', source: 'typical order of the bending strength of sputtered TiN microcantilevers, about 2–5 GPa (recalled, low confidence; measure your own film)' },
    },
  },
  {
    id: 'tungsten',
    title: 'Tungsten',
    properties: {
      youngs_modulus: { value: '411 GPa', source: `${TUNGSTEN}: 411 GPa, bulk` },
      poisson_ratio: { value: '0.28', source: `${TUNGSTEN}: 0.28, bulk` },
      thermal_expansion: { value: '4.5 ppm/K', source: `${TUNGSTEN}: 4.5e-6 /K at 25 °C, bulk` },
      resistivity: { value: '5.39e-8 ohm*m', source: `${TUNGSTEN}: 5.39 µΩ·cm near 20 °C, bulk (5.5 µΩ·cm in supplier tables; films are higher)` },
    },
  },
  {
    id: 'copper',
    title: 'Copper',
    properties: {
      youngs_modulus: { value: '120 GPa', source: 'typical value for polycrystalline copper, range 110–130 GPa (recalled range; electroplated films similar)' },
      poisson_ratio: { value: '0.34', source: 'typical value for polycrystalline copper, about 0.33–0.35 (recalled range)' },
      thermal_expansion: { value: '16.8 ppm/K', source: `${CALCUTT}: 16.8e-6 /K mean over 25–100 °C (17.3 over 20–200 °C, 17.7 over 20–300 °C: an anneal's excursion sees the larger mean)` },
      resistivity: { value: '1.68e-8 ohm*m', source: `typical value for pure bulk copper at 20 °C, range 1.67–1.72 µΩ·cm (16.7–17.2 nΩ·m quoted in the hypertextbook.com compilation Resistivity of Copper; annealed commercial copper 1.70–1.72 µΩ·cm, ${CALCUTT}); electroplated via copper is higher` },
    },
  },
  { id: 'aluminium-oxide', title: 'Aluminium oxide (Al₂O₃)', properties: { dielectric_constant: { value: '9', source: ROBERTSON } } },
  { id: 'hafnium-oxide', title: 'Hafnium oxide (HfO₂)', properties: { dielectric_constant: { value: '25', source: ROBERTSON } } },
  { id: 'zirconium-oxide', title: 'Zirconium oxide (ZrO₂)', properties: { dielectric_constant: { value: '25', source: `${ROBERTSON}; tetragonal films reach higher` } } },
  { id: 'tantalum-pentoxide', title: 'Tantalum pentoxide (Ta₂O₅)', properties: { dielectric_constant: { value: '22', source: ROBERTSON } } },
  { id: 'titanium-dioxide', title: 'Titanium dioxide (TiO₂)', properties: { dielectric_constant: { value: '80', source: ROBERTSON } } },
  {
    id: 'water',
    title: 'Water (rinse liquid)',
    properties: {
      surface_tension: { value: '71.97 mN/m', source: 'IAPWS R1-76(2014), γ = 235.8 mN/m·τ^1.256·(1 − 0.625τ), τ = 1 − T/647.096 K, at 25 °C' },
    },
  },
  {
    id: 'isopropanol',
    title: 'Isopropanol (2-propanol, rinse liquid)',
    properties: {
      surface_tension: { value: '20.9 mN/m', source: 'typical value at 25 °C, range 20.9–21.7 mN/m over 25–20 °C: 21.7 mN/m at 20 °C (Wikipedia, isopropyl alcohol data page); 20.9 mN/m at 25 °C (CRC Handbook, recalled)' },
    },
  },
];
