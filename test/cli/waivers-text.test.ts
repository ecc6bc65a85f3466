// What `check` prints about waivers: waived verdicts listed apart (waiver, owner, last day), a
// waiver that expired or that the value is beyond named with the failure that counts again, and a
// waiver that excuses nothing named too. Ids, dates and counts are the facts checked, not wording.
import { describe, expect, it } from 'vitest';
import { evaluateHandbook } from '../../src/checker/evaluate.ts';
import { renderCheckSummary } from '../../src/cli/text.ts';
import type { Handbook, Waiver } from '../../src/model/types.ts';
import { makeRule, makeStructure } from '../helpers.ts';

// Aspect ratios 3/0.25 = 12 and 2/0.25 = 8 against at most 10: the first fails, the second passes.
const deep = makeStructure('hole', { cd: 0.25, depth: 3 }, { id: 'deep-hole' });
const shallow = makeStructure('hole', { cd: 0.25, depth: 2 }, { id: 'shallow-hole' });
const rule = makeRule({ id: 'AR-1', quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 10 });

function waiver(id: string, structures: string[], over: Partial<Waiver> = {}): Waiver {
  return { id, rule: 'AR-1', appliesTo: { structures }, selectedBy: 'structures', reason: 'probe', owner: 'Avery Bench', approvedBy: 'Rowan Bench', expires: '2027-06-30', file: 'waivers/ar.yaml', pos: { file: 'waivers/ar.yaml', line: 4, column: 3 }, ...over };
}

const handbook = (waivers: Waiver[]): Handbook => ({ root: 'test', meta: { title: 'probe' }, structures: [deep, shallow], rules: [rule], waivers, materials: new Map(), warnings: [] });

describe('check summary with waivers', () => {
  it('lists a waived failure apart, with its waiver, owner, last day and place, and counts it as waived', () => {
    const h = handbook([waiver('W-AR-1', ['deep-hole'])]);
    const text = renderCheckSummary(h, evaluateHandbook(h, { on: '2027-06-30' }));
    expect(text).toMatch(/^waived +AR-1 +deep-hole +12 /m);
    const line = text.split('\n').find((l) => l.startsWith('  AR-1 on deep-hole')) ?? '';
    for (const fact of ['W-AR-1', '2027-06-30', 'Avery Bench', 'Rowan Bench', 'waivers/ar.yaml:4']) expect(line).toContain(fact);
    expect(text).toMatch(/1 pass, 0 fail \(0 blocking\), 1 waived/);
    expect(text).toContain('judged on 2027-06-30');
  });

  it('names an expired waiver and the failure that counts again', () => {
    const h = handbook([waiver('W-AR-1', ['deep-hole'])]);
    const text = renderCheckSummary(h, evaluateHandbook(h, { on: '2027-07-01' }));
    const line = text.split('\n').find((l) => l.includes('W-AR-1')) ?? '';
    for (const fact of ['expired', '2027-06-30', 'AR-1 on deep-hole', 'fails again']) expect(line).toContain(fact);
    expect(text).toMatch(/^FAIL +AR-1 +deep-hole/m);
    expect(text).toMatch(/1 pass, 1 fail \(1 blocking\), 0 waived/);
  });

  it('names a waiver the value is beyond, with the limit it requires', () => {
    // 12 is beyond at most 11.
    const h = handbook([waiver('W-AR-1', ['deep-hole'], { stillWithin: { comparison: 'at_most', limit: 11, written: '11' } })]);
    const line = renderCheckSummary(h, evaluateHandbook(h, { on: '2027-01-15' })).split('\n').find((l) => l.includes('W-AR-1')) ?? '';
    for (const fact of ['AR-1 on deep-hole', '≤ 11', 'it fails']) expect(line).toContain(fact);
  });

  it('names a waiver that waives nothing (the shallow hole passes)', () => {
    const h = handbook([waiver('W-AR-9', ['shallow-hole'])]);
    const text = renderCheckSummary(h, evaluateHandbook(h, { on: '2027-01-15' }));
    const line = text.split('\n').find((l) => l.includes('W-AR-9')) ?? '';
    for (const fact of ['W-AR-9', 'AR-1', 'waives nothing']) expect(line).toContain(fact);
  });

  it('says nothing of waivers for a handbook without any', () => {
    const h = handbook([]);
    expect(renderCheckSummary(h, evaluateHandbook(h, { on: '2027-01-15' }))).not.toMatch(/waiver/i);
  });
});
