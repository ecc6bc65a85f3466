// Property: no engine lets NaN or ±∞ into a verdict, and nothing throws, for any structure the
// loader accepts — at nominal and at every combination of tolerance ends (every relation the
// loader checks must hold at each corner it lets through, or some engine would see an impossible
// shape there).
//
// Structures are the demo handbook's, with every number moved by a random factor (log-uniform,
// ×0.4 … ×2.5) and every tolerance scaled (×0 … ×3), so the inputs range far around realistic
// values. Those the loader refuses are skipped (their refusal is the loader's job, tested apart).
// runPlan turns a non-finite engine result into a null with the reason "the formula gave a
// non-finite result": that reason must never appear.
import { loadHandbook } from '../../src/pipeline.ts';
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import fc from 'fast-check';
import { dump, load } from 'js-yaml';
import { describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { shapeOf } from '../../src/checker/plan.ts';
import { QUANTITIES } from '../../src/engines/index.ts';

import { MemorySource } from '../../src/model/memory-source.ts';
import type { Structure } from '../../src/model/types.ts';
import { makeRule } from '../helpers.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const MATERIALS = readFileSync(join(ROOT, 'materials.yaml'), 'utf8');
const DEMO = readdirSync(join(ROOT, 'structures')).filter((f) => f.endsWith('.yaml')).sort();

// A number with an optional unit and an optional symmetric tolerance: "34 nm ± 1.5 nm", "0.3", "50%".
const QUANTITY = /^(-?\d+(?:\.\d+)?(?:e[-+]?\d+)?)(\s*[^\s±+][^±]*?)?(?:\s*(±|\+\/-)\s*(\d+(?:\.\d+)?(?:e[-+]?\d+)?)(\s*\S.*)?)?$/;

/** Every numeric leaf of a parsed structure, moved by the next factor of `factors`. */
function perturb(value: unknown, next: () => [number, number]): unknown {
  if (typeof value === 'number') return value * next()[0];
  if (typeof value === 'string') {
    const m = QUANTITY.exec(value);
    if (!m) return value;
    const [f, g] = next();
    const nominal = Number(m[1]) * f;
    const unit = m[2] ?? '';
    const tol = m[4] !== undefined ? ` ± ${Number(m[4]) * f * g}${m[5] ?? ''}` : '';
    return `${nominal}${unit}${tol}`;
  }
  if (Array.isArray(value)) return value.map((v) => perturb(v, next));
  if (value && typeof value === 'object') return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, k === 'orientation' ? v : perturb(v, next)]));
  return value;
}

const factors = fc.array(fc.tuple(fc.double({ min: Math.log(0.4), max: Math.log(2.5), noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true })), { minLength: 60, maxLength: 60 });

/** Every quantity the engines have for this structure, per film step, evaluated at worst case. */
function problemsOf(s: Structure): string[] {
  const plans = new PlanCache();
  const found: string[] = [];
  for (const [name, def] of QUANTITIES) {
    const films = def.steps?.(shapeOf(s)) ?? [];
    for (const film of films.length ? films : [undefined]) {
      for (const comparison of ['at_least', 'at_most'] as const) {
        const v = evaluateRule(makeRule({ quantity: name, comparison, limit: 1, evaluateAt: 'worst-case', ...(film ? { film } : {}) }), s, plans);
        if (v.reason?.includes('non-finite')) found.push(`${name}${film ? `[${film}]` : ''} (${comparison}): ${v.reason}`);
        for (const step of v.trace?.steps ?? []) if (step.reason?.includes('non-finite')) found.push(`${step.name} in ${name}: ${step.reason}`);
      }
    }
  }
  for (const [name, q] of Object.entries(evaluateStructure(s).quantities)) if (q.reason?.includes('non-finite')) found.push(`${name} at nominal: ${q.reason}`);
  return found;
}

describe('engines over accepted inputs', () => {
  it.each(DEMO)('%s, moved around: no NaN or ±∞ reaches a verdict, at any corner', (file) => {
    const raw = load(readFileSync(join(ROOT, 'structures', file), 'utf8'));
    let accepted = 0;
    fc.assert(
      fc.property(factors, (fs) => {
        let i = 0;
        const next = (): [number, number] => {
          const [lf, g] = fs[i++ % fs.length]!;
          return [Math.exp(lf), g];
        };
        const text = dump(perturb(raw, next), { lineWidth: -1 });
        const r = loadHandbook(new MemorySource({ [`structures/${file}`]: text, 'materials.yaml': MATERIALS }));
        if (!r.ok) return true; // refused at load: not this property's business
        accepted++;
        expect(problemsOf(r.handbook.structures[0]!), text).toEqual([]);
        return true;
      }),
      { numRuns: Number(process.env.FC_RUNS ?? (/trench|tsv/.test(file) ? 4 : 25)), seed: Number(process.env.FC_SEED ?? 20261202) },
    );
    // The perturbation must leave most structures loadable, or the property would test nothing.
    expect(accepted).toBeGreaterThan(0);
  }, 120_000);
});
