// Built-in materials. Values are written with units, like a handbook's own, and converted at load.
// Each value names its source; "(recalled; confirm)" marks a value taken from a standard reference
// from memory rather than checked against the page, so a handbook that depends on it should
// override it with its own measured value.
//
// Film properties (modulus, resistivity) depend strongly on deposition: these are typical values
// for orientation, not process data.

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
const ROBERTSON = 'Robertson, Eur. Phys. J. Appl. Phys. 28, 265 (2004), Table 1';
const OKADA = 'Okada & Tokumaru, J. Appl. Phys. 56, 314 (1984), fit evaluated at 293 K';
const CRC = 'CRC Handbook of Chemistry and Physics (recalled; confirm)';
const FILM = 'typical thin-film value (recalled; process-dependent, override with your own data)';

export const BUILT_IN_MATERIALS: TableMaterial[] = [
  {
    id: 'silicon',
    title: 'Single-crystal silicon',
    properties: {
      youngs_modulus: { value: '169 GPa', source: `${HOPCROFT}: E along ⟨110⟩, the usual in-plane direction of lines on (001) wafers` },
      poisson_ratio: { value: '0.064', source: `${HOPCROFT}: ν for ⟨110⟩ loading with ⟨1-10⟩ lateral (recalled; confirm)` },
      thermal_expansion: { value: '2.509 ppm/K', source: OKADA },
      dielectric_constant: { value: '11.7', source: 'Sze & Ng, Physics of Semiconductor Devices, 3rd ed., Appendix (11.9 also quoted)' },
      fracture_strength: { value: '1 GPa', source: 'order of the bending strength of etched silicon microstructures (recalled; strongly surface-dependent)' },
    },
  },
  {
    id: 'polysilicon',
    title: 'Polycrystalline silicon',
    properties: {
      youngs_modulus: { value: '160 GPa', source: FILM },
      poisson_ratio: { value: '0.22', source: FILM },
      thermal_expansion: { value: '2.6 ppm/K', source: FILM },
      dielectric_constant: { value: '11.7', source: 'as single-crystal silicon' },
      resistivity: { value: '1e-5 ohm*m', source: 'heavily doped polysilicon, order of magnitude (recalled; doping-dependent)' },
    },
  },
  {
    id: 'silicon-dioxide',
    title: 'Silicon dioxide',
    properties: {
      youngs_modulus: { value: '70 GPa', source: FILM },
      poisson_ratio: { value: '0.17', source: FILM },
      thermal_expansion: { value: '0.5 ppm/K', source: 'fused silica (recalled; confirm)' },
      dielectric_constant: { value: '3.9', source: ROBERTSON },
    },
  },
  {
    id: 'silicon-nitride',
    title: 'Silicon nitride',
    properties: {
      youngs_modulus: { value: '250 GPa', source: FILM },
      poisson_ratio: { value: '0.23', source: FILM },
      thermal_expansion: { value: '3.3 ppm/K', source: FILM },
      dielectric_constant: { value: '7', source: ROBERTSON },
    },
  },
  {
    id: 'titanium-nitride',
    title: 'Titanium nitride',
    properties: {
      youngs_modulus: { value: '400 GPa', source: `${FILM}; films range 250–600 GPa` },
      poisson_ratio: { value: '0.25', source: FILM },
      thermal_expansion: { value: '9.4 ppm/K', source: FILM },
      resistivity: { value: '1e-6 ohm*m', source: `${FILM}; 20–200 µΩ·cm by process` },
      fracture_strength: { value: '3 GPa', source: 'order of the bending strength of sputtered TiN microcantilevers (recalled, low confidence; measure your own film)' },
    },
  },
  {
    id: 'tungsten',
    title: 'Tungsten',
    properties: {
      youngs_modulus: { value: '411 GPa', source: `${CRC}, bulk` },
      poisson_ratio: { value: '0.28', source: `${CRC}, bulk` },
      thermal_expansion: { value: '4.5 ppm/K', source: `${CRC}, bulk` },
      resistivity: { value: '5.28e-8 ohm*m', source: `${CRC}, bulk at 20 °C` },
    },
  },
  {
    id: 'copper',
    title: 'Copper',
    properties: {
      youngs_modulus: { value: '120 GPa', source: `${CRC}, polycrystalline bulk (110–130 GPa)` },
      poisson_ratio: { value: '0.34', source: `${CRC}, bulk` },
      thermal_expansion: { value: '16.5 ppm/K', source: `${CRC}, bulk at 20 °C` },
      resistivity: { value: '1.68e-8 ohm*m', source: `${CRC}, bulk at 20 °C` },
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
      surface_tension: { value: '20.9 mN/m', source: `${CRC}, 25 °C (21.7 mN/m at 20 °C)` },
    },
  },
];
