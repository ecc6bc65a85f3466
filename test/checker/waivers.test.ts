// Waivers in the checker: a failure a waiver selects is `waived` on and before the waiver's last
// day and with the value within its still_within, a failure again after; no other verdict ever
// changes. Values are worked by hand beside each check (aspect ratio = depth / CD).
import { describe, expect, it } from 'vitest';
import { applyWaivers, evaluateHandbook, evaluateRule, PlanCache, type Verdict } from '../../src/checker/evaluate.ts';
import type { Handbook, Rule, Structure, Waiver } from '../../src/model/types.ts';
import { makeRule, makeStructure, nm } from '../helpers.ts';

/** A hole 0.25 m wide and 3 m deep: aspect ratio 3/0.25 = 12 exactly (both dyadic). */
const deep = () => makeStructure('hole', { cd: 0.25, depth: 3 }, { id: 'deep-hole', tags: ['probe'] });
/** A hole 0.25 m wide and 2 m deep: aspect ratio 8 exactly. */
const shallow = () => makeStructure('hole', { cd: 0.25, depth: 2 }, { id: 'shallow-hole', tags: ['probe'] });
/** A hole without a depth: its aspect ratio is incomplete. */
const undrilled = () => makeStructure('hole', { cd: 100 * nm }, { id: 'undrilled-hole', tags: ['probe'] });
/** A pillar: a hole's rule on aspect ratio applies, but a rule scoped to holes does not. */
const pillar = () => makeStructure('pillar', { cd: 0.25, height: 3 }, { id: 'pillar', tags: ['probe'] });

/** At most 10: the deep hole fails (12 > 10, margin (10 − 12)/10 = −0.2), the shallow one passes (8). */
const arRule = (over: Partial<Rule> & { comparison?: 'at_least' | 'at_most'; limit?: number } = {}) => makeRule({ id: 'AR-1', quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 10, appliesTo: { kinds: ['hole'] }, ...over });

function waiver(over: Partial<Waiver> = {}): Waiver {
  return {
    id: 'W-AR-1',
    rule: 'AR-1',
    appliesTo: { structures: ['deep-hole'] },
    selectedBy: 'structures',
    reason: 'Accepted for the probe lot.',
    owner: 'Avery Bench',
    approvedBy: 'Rowan Bench',
    expires: '2027-06-30',
    file: 'waivers/ar.yaml',
    pos: { file: 'waivers/ar.yaml', line: 1, column: 1 },
    ...over,
  };
}

function handbook(rules: Rule[], structures: Structure[], waivers: Waiver[]): Handbook {
  return { root: 'test', meta: { title: 'waiver probe' }, structures, rules, waivers, materials: new Map(), warnings: [] };
}

const find = (vs: Verdict[], rule: string, structure: string) => vs.find((v) => v.rule === rule && v.structure === structure)!;

describe('a waiver of a failure, by date (its last day is 2027-06-30, read inclusively)', () => {
  const h = handbook([arRule()], [deep(), shallow()], [waiver()]);

  it('waives the failure before its last day, with the waiver named', () => {
    const r = evaluateHandbook(h, { on: '2027-06-29' });
    const v = find(r.verdicts, 'AR-1', 'deep-hole');
    expect(v.status).toBe('waived');
    // The value and margin are the failure's own: 12, (10 − 12)/10 = −0.2.
    expect(v.value).toBe(12);
    expect(v.margin).toBeCloseTo(-0.2, 12);
    expect(v.waiver).toEqual({ id: 'W-AR-1', reason: 'Accepted for the probe lot.', owner: 'Avery Bench', approvedBy: 'Rowan Bench', expires: '2027-06-30', file: 'waivers/ar.yaml', line: 1, column: 1 });
    expect(r.counts).toMatchObject({ fail: 0, waived: 1, pass: 1 });
    expect(r.blockingFailures).toBe(0);
    expect(r.on).toBe('2027-06-29');
  });

  it('waives it on its last day itself', () => {
    const r = evaluateHandbook(h, { on: '2027-06-30' });
    expect(find(r.verdicts, 'AR-1', 'deep-hole').status).toBe('waived');
    expect(r.waivers).toEqual([{ id: 'W-AR-1', rule: 'AR-1', expires: '2027-06-30', expired: false, waives: ['deep-hole'], lapsed: [], unused: false, state: 'active' }]);
  });

  it('counts the failure again the day after, naming the waiver that expired', () => {
    const r = evaluateHandbook(h, { on: '2027-07-01' });
    const v = find(r.verdicts, 'AR-1', 'deep-hole');
    expect(v.status).toBe('fail');
    expect(v.waiver?.id).toBe('W-AR-1');
    expect(v.waiver?.lapsed).toBe('expired');
    expect(r.counts).toMatchObject({ fail: 1, waived: 0 });
    expect(r.blockingFailures).toBe(1);
    expect(r.waivers).toEqual([{ id: 'W-AR-1', rule: 'AR-1', expires: '2027-06-30', expired: true, waives: [], lapsed: [{ structure: 'deep-hole', lapsed: 'expired' }], unused: false, state: 'expired' }]);
  });

  it('compares dates across a year’s end (a last day of 2026-12-31 has expired on 2027-01-01)', () => {
    const year = handbook([arRule()], [deep()], [waiver({ expires: '2026-12-31' })]);
    expect(find(evaluateHandbook(year, { on: '2026-12-31' }).verdicts, 'AR-1', 'deep-hole').status).toBe('waived');
    expect(find(evaluateHandbook(year, { on: '2027-01-01' }).verdicts, 'AR-1', 'deep-hole').status).toBe('fail');
  });

  it('refuses an evaluation date that is not a calendar day (a caller’s bug)', () => {
    expect(() => evaluateHandbook(h, { on: '2027-02-30' })).toThrow(/not a calendar date/);
    expect(() => evaluateHandbook(h, { on: '30/06/2027' })).toThrow(/not a calendar date/);
  });
});

describe('still_within: a limit the waived value must still meet', () => {
  const on = { on: '2027-01-15' };

  it('waives a value within it, and one exactly at it', () => {
    // 12 ≤ 12.5 and 12 ≤ 12 (at the floor passes, as at a rule's limit).
    for (const limit of [12.5, 12]) {
      const h = handbook([arRule()], [deep()], [waiver({ stillWithin: { comparison: 'at_most', limit, written: String(limit) } })]);
      const v = find(evaluateHandbook(h, on).verdicts, 'AR-1', 'deep-hole');
      expect(v.status, `at most ${limit}`).toBe('waived');
      expect(v.waiver?.stillWithin).toEqual({ comparison: 'at_most', limit });
    }
  });

  it('keeps the failure when the value is beyond it', () => {
    // 12 > 11.5: the waiver does not cover it.
    const h = handbook([arRule()], [deep()], [waiver({ stillWithin: { comparison: 'at_most', limit: 11.5, written: '11.5' } })]);
    const r = evaluateHandbook(h, on);
    const v = find(r.verdicts, 'AR-1', 'deep-hole');
    expect(v.status).toBe('fail');
    expect(v.waiver?.lapsed).toBe('beyond-floor');
    expect(r.blockingFailures).toBe(1);
    expect(r.waivers[0]).toMatchObject({ state: 'active', expired: false, waives: [], lapsed: [{ structure: 'deep-hole', lapsed: 'beyond-floor' }], unused: false });
  });

  it('works the other way for an at_least rule', () => {
    // At least 16: 12 fails; a waiver floor of at least 11 covers it, one of at least 13 does not.
    const rule = arRule({ comparison: 'at_least', limit: 16 });
    const with11 = handbook([rule], [deep()], [waiver({ stillWithin: { comparison: 'at_least', limit: 11, written: '11' } })]);
    const with13 = handbook([rule], [deep()], [waiver({ stillWithin: { comparison: 'at_least', limit: 13, written: '13' } })]);
    expect(find(evaluateHandbook(with11, on).verdicts, 'AR-1', 'deep-hole').status).toBe('waived');
    expect(find(evaluateHandbook(with13, on).verdicts, 'AR-1', 'deep-hole').status).toBe('fail');
  });

  it('cannot show a failure without a value to be within it; without still_within it is waived', () => {
    const noValue: Verdict = { ...evaluateRule(arRule(), deep(), new PlanCache()), value: null, margin: null, reason: 'no value' };
    const floored = applyWaivers([noValue], { structures: [deep()], waivers: [waiver({ stillWithin: { comparison: 'at_most', limit: 100, written: '100' } })] }, '2027-01-15');
    expect([floored.verdicts[0]!.status, floored.verdicts[0]!.waiver?.lapsed]).toEqual(['fail', 'beyond-floor']);
    const plain = applyWaivers([noValue], { structures: [deep()], waivers: [waiver()] }, '2027-01-15');
    expect(plain.verdicts[0]!.status).toBe('waived');
  });
});

describe('what a waiver never changes', () => {
  const on = { on: '2027-01-15' };

  it('leaves a pass, an incomplete and a not-applicable verdict as they are, and calls itself unused', () => {
    // The shallow hole passes (8 ≤ 10), the undrilled one is incomplete, the pillar is outside
    // the rule's scope (holes only); the waiver selects all three and only them.
    const w = waiver({ appliesTo: { tags: ['probe'] }, selectedBy: 'applies_to' });
    const h = handbook([arRule()], [shallow(), undrilled(), pillar()], [w]);
    const plain = evaluateHandbook(handbook([arRule()], [shallow(), undrilled(), pillar()], []), on);
    const r = evaluateHandbook(h, on);
    expect(r.verdicts.map((v) => v.status)).toEqual(['pass', 'incomplete', 'not-applicable']);
    expect(r.verdicts).toEqual(plain.verdicts);
    expect(r.verdicts.every((v) => v.waiver === undefined)).toBe(true);
    expect(r.waivers).toEqual([{ id: 'W-AR-1', rule: 'AR-1', expires: '2027-06-30', expired: false, waives: [], lapsed: [], unused: true, state: 'unused' }]);
  });

  it('waives only its own rule', () => {
    const other = arRule({ id: 'AR-2' });
    const r = evaluateHandbook(handbook([arRule(), other], [deep()], [waiver()]), on);
    expect([find(r.verdicts, 'AR-1', 'deep-hole').status, find(r.verdicts, 'AR-2', 'deep-hole').status]).toEqual(['waived', 'fail']);
    expect(r.blockingFailures).toBe(1);
  });

  it('waives only the structures it selects', () => {
    // Two deep holes fail AR-1; the waiver names one.
    const twin = makeStructure('hole', { cd: 0.25, depth: 3 }, { id: 'twin-hole' });
    const r = evaluateHandbook(handbook([arRule()], [deep(), twin], [waiver()]), on);
    expect([find(r.verdicts, 'AR-1', 'deep-hole').status, find(r.verdicts, 'AR-1', 'twin-hole').status]).toEqual(['waived', 'fail']);
  });

  it('does not change the verdicts it is given', () => {
    const v = evaluateRule(arRule(), deep(), new PlanCache());
    const before = JSON.stringify(v);
    applyWaivers([v], { structures: [deep()], waivers: [waiver()] }, '2027-01-15');
    expect(JSON.stringify(v)).toBe(before);
  });
});

describe('blocking failures and several waivers', () => {
  const on = { on: '2027-01-15' };

  it('counts a waived advisory failure as waived, and neither as a blocking failure', () => {
    const advisory = arRule({ id: 'AR-ADV', severity: 'advisory' });
    const r = evaluateHandbook(handbook([arRule(), advisory], [deep()], [waiver(), waiver({ id: 'W-AR-ADV', rule: 'AR-ADV' })]), on);
    expect(r.counts).toMatchObject({ fail: 0, waived: 2 });
    expect(r.blockingFailures).toBe(0);
  });

  it('uses a waiver that holds when another for the same failure has expired', () => {
    // W-AR-0 (expired 2026-12-31) sorts before W-AR-1 (holds): the failure is waived by W-AR-1,
    // and W-AR-0 is expired without a failure counting again because of it.
    const r = evaluateHandbook(handbook([arRule()], [deep()], [waiver(), waiver({ id: 'W-AR-0', expires: '2026-12-31' })]), on);
    expect(find(r.verdicts, 'AR-1', 'deep-hole').waiver?.id).toBe('W-AR-1');
    expect(r.waivers.map((w) => [w.id, w.state, w.waives, w.lapsed])).toEqual([
      ['W-AR-0', 'expired', [], []],
      ['W-AR-1', 'active', ['deep-hole'], []],
    ]);
  });

  it('names the first lapsed waiver by id when none holds', () => {
    const r = evaluateHandbook(handbook([arRule()], [deep()], [waiver({ id: 'W-AR-2', expires: '2026-01-01' }), waiver({ id: 'W-AR-0', expires: '2026-12-31' })]), on);
    const v = find(r.verdicts, 'AR-1', 'deep-hole');
    expect([v.status, v.waiver?.id, v.waiver?.lapsed]).toEqual(['fail', 'W-AR-0', 'expired']);
    expect(r.waivers.map((w) => [w.id, w.lapsed.length])).toEqual([['W-AR-0', 1], ['W-AR-2', 0]]);
  });
});
