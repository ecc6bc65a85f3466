// A structure's `variation:` block: how its toleranced inputs vary when a rule samples them.
// Without it every tolerance band is ±3σ of a normal distribution and the inputs vary independently.
import { cholesky } from '../linear.ts';
import type { Correlation, Param } from '../types.ts';
import { type FileReport, isMapping, suggest } from './file-report.ts';

/**
 * Marks the inputs `uniform` lists as evenly spread over their band, and returns the correlations
 * `correlated` states. Every named input must be one the structure has, with a tolerance; a pair is
 * named once; together the coefficients must be those of a possible joint distribution.
 */
export function readVariation(report: FileReport, raw: unknown, params: Map<string, Param>): Correlation[] {
  if (!isMapping(raw)) return []; // absent, or reported by the schema
  const named = (pointer: string, name: unknown): name is string => {
    if (typeof name !== 'string') return false; // reported by the schema
    const p = params.get(name);
    if (!p) {
      const names = [...params.values()].filter((q) => q.low !== undefined).map((q) => q.name);
      report.add('bad-value', pointer, { expected: 'a toleranced input of this structure', found: `"${name}"`, suggestions: suggest(name, names) });
      return false;
    }
    if (p.low === undefined) {
      report.add('bad-value', pointer, { expected: 'an input with a tolerance (only a tolerance band can vary)', found: `"${name}" (${p.written})` });
      return false;
    }
    return true;
  };
  if (Array.isArray(raw.uniform)) {
    raw.uniform.forEach((name, i) => {
      if (named(`/variation/uniform/${i}`, name)) params.set(name, { ...params.get(name)!, spread: 'uniform' });
    });
  }
  const correlations: Correlation[] = [];
  const seen = new Set<string>();
  if (Array.isArray(raw.correlated)) {
    raw.correlated.forEach((c, i) => {
      if (!isMapping(c) || !Array.isArray(c.inputs) || typeof c.coefficient !== 'number') return; // reported by the schema
      const base = `/variation/correlated/${i}`;
      const [a, b] = c.inputs as unknown[];
      const okA = named(`${base}/inputs/0`, a);
      const okB = named(`${base}/inputs/1`, b);
      if (!okA || !okB) return;
      if (a === b) return report.add('bad-value', `${base}/inputs/1`, { expected: 'two different inputs', found: `"${b}" twice` });
      const key = [a, b].sort().join(' ');
      if (seen.has(key)) return report.add('bad-value', `${base}/inputs`, { expected: 'each pair of inputs correlated once', found: `${a} and ${b} again` });
      seen.add(key);
      correlations.push({ inputs: [a, b], coefficient: c.coefficient, pos: report.pos(base) });
    });
  }
  if (correlations.length && !possible(correlations)) {
    report.add('bad-value', '/variation/correlated', { expected: 'coefficients that together describe a possible joint distribution (a positive definite correlation matrix)', found: correlations.map((c) => `${c.inputs[0]}–${c.inputs[1]} ${c.coefficient}`).join(', ') });
  }
  return correlations;
}

function possible(correlations: Correlation[]): boolean {
  const names = [...new Set(correlations.flatMap((c) => c.inputs))];
  const n = names.length;
  const m = new Float64Array(n * n);
  for (let i = 0; i < n; i++) m[i * n + i] = 1;
  for (const c of correlations) {
    const i = names.indexOf(c.inputs[0]);
    const j = names.indexOf(c.inputs[1]);
    m[i * n + j] = m[j * n + i] = c.coefficient;
  }
  return cholesky(m, n) !== null;
}
