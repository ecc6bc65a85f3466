// The numerical tools the engines share, held to numbers from outside the project:
// - Gauss–Legendre nodes and weights: Abramowitz & Stegun, Handbook of Mathematical Functions
//   (1964), Table 25.4 (n = 2, 3, 5), and the exactness of an n-point rule for polynomials of
//   degree up to 2n − 1 (its defining property);
// - integrals with closed forms (∫₀^π sin = 2, ∫₀¹ eˣ = e − 1, ∫₁² dx/x = ln 2);
// - a tridiagonal system solved by hand (shown below).
import { describe, expect, it } from 'vitest';
import { gaussLegendre, integrate, solveTridiagonal } from '../../src/engines/numeric.ts';

describe('Gauss–Legendre rules', () => {
  it('match Abramowitz & Stegun Table 25.4 for n = 2, 3 and 5', () => {
    const two = gaussLegendre(2);
    expect(two.x.map(Math.abs)).toEqual([expect.closeTo(0.577350269189626, 14), expect.closeTo(0.577350269189626, 14)]);
    expect(two.w).toEqual([expect.closeTo(1, 14), expect.closeTo(1, 14)]);
    const three = gaussLegendre(3);
    const byX3 = three.x.map((x, i) => [x, three.w[i]!] as const).sort((a, b) => a[0] - b[0]);
    expect(byX3.map(([x]) => x)).toEqual([expect.closeTo(-0.774596669241483, 14), expect.closeTo(0, 14), expect.closeTo(0.774596669241483, 14)]);
    expect(byX3.map(([, w]) => w)).toEqual([expect.closeTo(0.555555555555556, 14), expect.closeTo(0.888888888888889, 14), expect.closeTo(0.555555555555556, 14)]);
    const five = gaussLegendre(5);
    const byX5 = five.x.map((x, i) => [x, five.w[i]!] as const).sort((a, b) => a[0] - b[0]);
    const table = [
      [-0.906179845938664, 0.236926885056189],
      [-0.538469310105683, 0.478628670499366],
      [0, 0.568888888888889],
      [0.538469310105683, 0.478628670499366],
      [0.906179845938664, 0.236926885056189],
    ];
    byX5.forEach(([x, w], i) => {
      expect(x).toBeCloseTo(table[i]![0]!, 14);
      expect(w).toBeCloseTo(table[i]![1]!, 14);
    });
  });

  it('integrate polynomials of degree up to 2n − 1 exactly, and not degree 2n', () => {
    // ∫₋₁¹ x^k dx = 2/(k + 1) for even k, 0 for odd k.
    for (const n of [4, 6, 12]) {
      const { x, w } = gaussLegendre(n);
      const quad = (k: number) => x.reduce((s, xi, i) => s + w[i]! * xi ** k, 0);
      for (let k = 0; k <= 2 * n - 1; k++) expect(quad(k), `n = ${n}, x^${k}`).toBeCloseTo(k % 2 ? 0 : 2 / (k + 1), 13);
      expect(Math.abs(quad(2 * n) - 2 / (2 * n + 1)), `n = ${n}, x^${2 * n}`).toBeGreaterThan(1e-8);
    }
  });

  it('has weights that sum to 2, the length of [−1, 1]', () => {
    const { w } = gaussLegendre(7);
    expect(w.reduce((s, wi) => s + wi, 0)).toBeCloseTo(2, 14);
  });
});

describe('composite Gauss–Legendre integration', () => {
  it('reproduces integrals with closed forms', () => {
    expect(integrate(Math.sin, 0, Math.PI)).toBeCloseTo(2, 13);
    expect(integrate(Math.exp, 0, 1, 1)).toBeCloseTo(Math.E - 1, 13);
    expect(integrate((x) => 1 / x, 1, 2, 3)).toBeCloseTo(Math.LN2, 13);
    // A reversed interval changes the sign; an empty one gives nothing.
    expect(integrate(Math.exp, 1, 0, 2)).toBeCloseTo(1 - Math.E, 13);
    expect(integrate(Math.exp, 2, 2)).toBe(0);
  });

  it('uses its panels: a kink inside one panel costs accuracy that more panels win back', () => {
    // ∫₀¹ |x − 1/3| dx = 5/18: with one panel the kink sits inside it; with three it falls on a panel edge.
    const kink = (x: number) => Math.abs(x - 1 / 3);
    expect(Math.abs(integrate(kink, 0, 1, 1) - 5 / 18)).toBeGreaterThan(1e-6);
    expect(integrate(kink, 0, 1, 3)).toBeCloseTo(5 / 18, 13);
  });
});

describe('the tridiagonal solver', () => {
  it('solves a system worked by hand', () => {
    // [2 1 0 0; 1 3 1 0; 0 1 4 1; 0 0 2 5]·x = [4 10 18 26] has x = [1 2 3 4]:
    // 2 + 2 = 4, 1 + 6 + 3 = 10, 2 + 12 + 4 = 18, 6 + 20 = 26.
    const x = solveTridiagonal(
      Float64Array.from([0, 1, 1, 2]),
      Float64Array.from([2, 3, 4, 5]),
      Float64Array.from([1, 1, 1, 0]),
      Float64Array.from([4, 10, 18, 26]),
    );
    x.forEach((v, i) => expect(v, `x${i}`).toBeCloseTo(i + 1, 13));
  });

  it('solves the finite-difference Poisson problem u″ = −2 on [0, 1], whose exact solution x(1 − x) it reproduces at the nodes', () => {
    // Central differences are exact for a quadratic, so the nodal values are x(1 − x) exactly.
    const n = 9;
    const h = 1 / (n + 1);
    const a = new Float64Array(n).fill(1);
    const b = new Float64Array(n).fill(-2);
    const c = new Float64Array(n).fill(1);
    const r = new Float64Array(n).fill(-2 * h * h);
    solveTridiagonal(a, b, c, r).forEach((u, i) => {
      const x = (i + 1) * h;
      expect(u, `node ${i}`).toBeCloseTo(x * (1 - x), 13);
    });
  });
});
