// The SARIF export. The log is validated against the OASIS SARIF 2.1.0 JSON schema, kept byte for
// byte in test/data/sarif-schema-2.1.0.json (from the OASIS SARIF TC's repository,
// Schemata/sarif-schema-2.1.0.json, the errata01 text: its id names .../v2.1.0/errata01/os/...).
// Section numbers (§) are those of the OASIS standard, "Static Analysis Results Interchange Format
// (SARIF) Version 2.1.0 Plus Errata 01". The handbook is test/fixtures/ok_sarif, read through the
// real loader and checker; lines and columns were read off its files by hand and are quoted beside
// each check. Numbers in messages were worked by hand from the fixture's inputs.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { ErrorObject } from 'ajv';
import { sarifValidator, rawSchema, schemaText, type Json } from './sarif-schema.ts';
import { describe, expect, it } from 'vitest';
import { evaluateHandbook, type Results, type Status, type Verdict, type WaiverRef } from '../../src/checker/evaluate.ts';

import type { Handbook } from '../../src/model/types.ts';
import { urls } from '../../src/report/assemble.ts';
import { compareWithBaseline, FINGERPRINT_KEY, REPO_ROOT, toSarif, type SarifLog, type SarifResult } from '../../src/report/sarif.ts';

const SCHEMA_FILE = fileURLToPath(new URL('../data/sarif-schema-2.1.0.json', import.meta.url));
const FIXTURE = fileURLToPath(new URL('../fixtures/ok_sarif', import.meta.url));
const SITE = 'https://reports.example.invalid/fixture';

// ---------------------------------------------------------------------------------------------
// The schema, and a validator that bites.

const validate = sarifValidator();

/** What a consumer reads: the log as JSON text, parsed again. */
function errorsOf(log: unknown): ErrorObject[] {
  return validate(JSON.parse(JSON.stringify(log))) ? [] : (validate.errors ?? []);
}

// ---------------------------------------------------------------------------------------------
// The fixture, and verdicts built by hand.

function loadFixture(): Handbook {
  const r = loadHandbookFolder(FIXTURE);
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.handbook;
}
const handbook = loadFixture();

const WAIVER: WaiverRef = {
  id: 'W-EX-1',
  reason: 'The second hole is etched with the long-step recipe; its depth is accepted until the retrofit.',
  owner: 'etch module owner',
  approvedBy: 'design-rule board',
  expires: '2031-06-30',
  file: 'waivers/ex-ar-1.yaml',
  line: 1,
  column: 3,
};

/** Results over these verdicts: the checker's own, with verdicts, counts and blocking failures replaced. */
function resultsOf(verdicts: Verdict[]): Results {
  const counts: Record<Status, number> = { pass: 0, fail: 0, waived: 0, incomplete: 0, 'not-applicable': 0 };
  for (const v of verdicts) counts[v.status]++;
  const blockingFailures = verdicts.filter((v) => v.status === 'fail' && v.severity === 'blocking').length;
  return { ...evaluateHandbook(handbook, { on: "2026-12-02" }), verdicts, counts, blockingFailures };
}

/**
 * The fixture's verdicts, with EX-AR-1 on twin-hole waived: the waiver loader is another change, so
 * the waived verdict is made here as the checker would make it (status 'waived', `waiver` set).
 */
function fixtureResults(): Results {
  const verdicts = evaluateHandbook(handbook, { on: "2026-12-02" }).verdicts.map((v): Verdict => (v.rule === 'EX-AR-1' && v.structure === 'twin-hole' ? { ...v, status: 'waived', waiver: WAIVER } : v));
  return resultsOf(verdicts);
}

function find(log: SarifLog, rule: string, structure: string): SarifResult {
  const r = log.runs[0].results.find((x) => x.partialFingerprints[FINGERPRINT_KEY] === `${rule}/${structure}`);
  if (!r) throw new Error(`no result for ${rule}/${structure}`);
  return r;
}

const fullLog = (): SarifLog =>
  toSarif({
    handbook,
    results: fixtureResults(),
    toolVersion: '0.1.0',
    uriBase: 'handbook/',
    siteUrl: SITE,
    revision: { commit: '0123456789abcdef0123456789abcdef01234567', repositoryUri: 'https://git.example.invalid/fixture.git' },
    startTimeUtc: '2030-01-02T03:04:05Z',
  });

// ---------------------------------------------------------------------------------------------

describe('the schema file', () => {
  it('is the OASIS SARIF 2.1.0 schema, in draft-04 with no draft-04-only keyword forms', () => {
    expect(rawSchema.title).toBe('Static Analysis Results Format (SARIF) Version 2.1.0 JSON Schema');
    expect(rawSchema.id).toBe('https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json');
    expect(rawSchema.$schema).toBe('http://json-schema.org/draft-04/schema#');
    // 112,768 bytes, the length the OASIS repository's file has (it is ASCII, so characters = bytes).
    expect(Buffer.byteLength(schemaText)).toBe(112768);
    const found: string[] = [];
    const walk = (node: Json, path: string): void => {
      if (Array.isArray(node)) node.forEach((n, i) => walk(n, `${path}/${i}`));
      else if (node !== null && typeof node === 'object') {
        for (const [k, v] of Object.entries(node)) {
          if ((k === 'exclusiveMinimum' || k === 'exclusiveMaximum') && typeof v === 'boolean') found.push(`${path}/${k}`);
          walk(v, `${path}/${k}`);
        }
      }
    };
    walk(rawSchema, '');
    expect(found).toEqual([]);
  });

  it('bites: a level outside §3.27.10, a result without its required message (§3.27.11), a region line 0 (§3.30.5)', () => {
    const log = JSON.parse(JSON.stringify(fullLog())) as { runs: Array<{ results: Array<Record<string, Json>> }> };
    expect(errorsOf(log)).toEqual([]);

    const badLevel = structuredClone(log);
    badLevel.runs[0]!.results[0]!.level = 'fatal';
    expect(errorsOf(badLevel).map((e) => [e.instancePath, e.keyword])).toContainEqual(['/runs/0/results/0/level', 'enum']);

    const noMessage = structuredClone(log);
    delete noMessage.runs[0]!.results[0]!.message;
    expect(errorsOf(noMessage).map((e) => [e.instancePath, e.keyword])).toContainEqual(['/runs/0/results/0', 'required']);

    const lineZero = structuredClone(log) as unknown as { runs: Array<{ results: Array<{ locations: Array<{ physicalLocation: { region: { startLine: number } } }> }> }> };
    lineZero.runs[0]!.results[0]!.locations[0]!.physicalLocation.region.startLine = 0;
    expect(errorsOf(lineZero).map((e) => [e.instancePath, e.keyword])).toContainEqual(['/runs/0/results/0/locations/0/physicalLocation/region/startLine', 'minimum']);
  });
});

describe('toSarif', () => {
  it('validates against the SARIF 2.1.0 schema with every option, and with none', () => {
    const log = fullLog();
    expect(errorsOf(log)).toEqual([]);
    const bare = toSarif({ handbook, results: fixtureResults(), toolVersion: '0.1.0', uriBase: '' });
    expect(errorsOf(bare)).toEqual([]);
    expect(bare.$schema).toBe('https://json.schemastore.org/sarif-2.1.0.json');
    expect(bare.version).toBe('2.1.0');
  });

  it('reports fail, waived and incomplete verdicts, sorted by rule then structure; pass and not-applicable are not results', () => {
    const log = fullLog();
    // §3.27.9 kind and §3.27.10 level: a blocking failure is an error, an advisory one a warning, a
    // waived one keeps its level and is suppressed (§3.27.23); an incomplete verdict is "open" (the
    // tool could not decide), and a kind other than "fail" has level "none".
    expect(log.runs[0].results.map((r) => [r.partialFingerprints[FINGERPRINT_KEY], r.kind, r.level, r.suppressions?.length ?? 0])).toEqual([
      ['EX-AR-1/deep-hole', 'fail', 'error', 0],
      ['EX-AR-1/twin-hole', 'fail', 'error', 1],
      ['EX-BOTTOM-1/deep-hole', 'fail', 'warning', 0],
      ['EX-BOTTOM-1/open-hole', 'open', 'none', 0],
      ['EX-SPACE-1/deep-hole', 'fail', 'error', 0],
    ]);
    // §3.27.5 ruleId and §3.27.6 ruleIndex point into tool.driver.rules (§3.19), sorted by id.
    const rules = log.runs[0].tool.driver.rules;
    expect(rules.map((r) => r.id)).toEqual(['EX-AR-1', 'EX-BOTTOM-1', 'EX-SPACE-1']);
    for (const r of log.runs[0].results) expect(rules[r.ruleIndex!]!.id).toBe(r.ruleId);
  });

  it('describes each rule (§3.49): title, rationale, level by severity, the limit; helpUri is the site URL and the rule page path', () => {
    const [ar, bottom] = fullLog().runs[0].tool.driver.rules;
    expect(ar).toMatchObject({
      id: 'EX-AR-1',
      name: 'HoleAspectRatioAtMost12',
      shortDescription: { text: 'Hole aspect ratio at most 12' },
      fullDescription: { text: 'Fixture rule for the SARIF export.' },
      defaultConfiguration: { level: 'error' },
      properties: { quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 12 },
    });
    expect(bottom?.defaultConfiguration.level).toBe('warning');
    // "at_least: 30 nm" in rules/holes.yaml, in SI.
    expect(bottom?.properties).toMatchObject({ quantity: 'geometry.bottom_cd', comparison: 'at_least', limit: 30e-9, unit: 'm' });
    // §3.49.12 helpUri: the rule page the report builds (src/report/assemble.ts `urls.rule`).
    expect(ar?.helpUri).toBe(SITE + urls.rule('EX-AR-1'));
    expect(ar?.helpUri).toBe('https://reports.example.invalid/fixture/rules/EX-AR-1/');
    expect(toSarif({ handbook, results: fixtureResults(), toolVersion: '0.1.0', uriBase: '', siteUrl: `${SITE}/` }).runs[0].tool.driver.rules[0]?.helpUri).toBe(ar?.helpUri);
  });

  it('links each result to its verdict page only when the site URL is known', () => {
    const r = find(fullLog(), 'EX-AR-1', 'deep-hole');
    expect(r.properties.verdictPage).toBe(SITE + urls.verdict('EX-AR-1', 'deep-hole'));
    const bare = toSarif({ handbook, results: fixtureResults(), toolVersion: '0.1.0', uriBase: '' });
    expect(bare.runs[0].tool.driver.informationUri).toBeUndefined();
    expect(bare.runs[0].tool.driver.rules.some((x) => x.helpUri !== undefined)).toBe(false);
    expect(bare.runs[0].results.some((x) => x.properties.verdictPage !== undefined)).toBe(false);
  });

  it('says value, limit and margin in the message (§3.27.11)', () => {
    const log = fullLog();
    // deep-hole at the worst corner: depth 600 + 10 nm over cd 40 − 2 nm = 610/38 = 16.05;
    // margin (12 − 16.05)/12 = −33.8 %.
    expect(find(log, 'EX-AR-1', 'deep-hole').message.text).toBe(
      'deep-hole fails EX-AR-1: aspect ratio is 16.05 at the worst tolerance corner, against a limit of ≤ 12 (margin -33.8 %).',
    );
    // Bottom width at nominal: 40 nm − 2 × 600 nm × tan(0.5°) = 40 − 1200 × 0.0087269 = 29.53 nm
    // (tan 0.5° = 0.0087269, common value); margin (29.53 − 30)/30 = −1.57 %.
    expect(find(log, 'EX-BOTTOM-1', 'deep-hole').message.text).toBe(
      'deep-hole fails EX-BOTTOM-1: bottom critical dimension is 29.53 nm at nominal, against a limit of ≥ 30 nm (margin -1.57 %).',
    );
    expect(find(log, 'EX-BOTTOM-1', 'open-hole').message.text).toBe('open-hole cannot be checked against EX-BOTTOM-1: it needs geometry.sidewall_angle.');
    // twin-hole: (560 + 10)/38 = 15.00; margin (12 − 15)/12 = −25 %.
    expect(find(log, 'EX-AR-1', 'twin-hole').message.text).toBe(
      'twin-hole fails EX-AR-1 under waiver W-EX-1: aspect ratio is 15 at the worst tolerance corner, against a limit of ≤ 12 (margin -25 %).',
    );
  });

  it('places each result at the deciding input in the structure file, and relates it to the rule (§3.28, §3.29, §3.30)', () => {
    const log = fullLog();
    const at = (r: SarifResult, i = 0) => {
      const p = r.locations[i]!.physicalLocation;
      return [p.artifactLocation.uriBaseId, p.artifactLocation.uri, p.region.startLine, p.region.startColumn];
    };
    const rel = (r: SarifResult) => {
      const p = r.relatedLocations![0]!.physicalLocation;
      return [p.artifactLocation.uri, p.region.startLine, p.region.startColumn];
    };
    // Worst case: the first input of the worst corner is the depth,
    // structures/deep-hole.yaml line 7 "  depth: 600 nm ± 10 nm", its value at column 10.
    const ar = find(log, 'EX-AR-1', 'deep-hole');
    expect(at(ar)).toEqual([REPO_ROOT, 'handbook/structures/deep-hole.yaml', 7, 10]);
    // The rule: rules/holes.yaml line 1 "- id: EX-AR-1", its id at column 3.
    expect(rel(ar)).toEqual(['handbook/rules/holes.yaml', 1, 3]);
    // Worst case whose first input (the pitch, line 8, no tolerance) is not in the corner: the
    // corner's first input is the cd, line 6 "  cd: 40 nm ± 2 nm", its value at column 7.
    const space = find(log, 'EX-SPACE-1', 'deep-hole');
    expect(at(space)).toEqual([REPO_ROOT, 'handbook/structures/deep-hole.yaml', 6, 7]);
    expect(rel(space)).toEqual(['handbook/rules/holes.yaml', 19, 3]);
    // Nominal: the first input written in the handbook, the cd (line 6, column 7).
    expect(at(find(log, 'EX-BOTTOM-1', 'deep-hole'))).toEqual([REPO_ROOT, 'handbook/structures/deep-hole.yaml', 6, 7]);
    expect(rel(find(log, 'EX-BOTTOM-1', 'deep-hole'))).toEqual(['handbook/rules/holes.yaml', 10, 3]);
    // Incomplete, no trace: the structure itself, structures/open-hole.yaml line 2 "id: open-hole"
    // (line 1 is a comment), column 1.
    expect(at(find(log, 'EX-BOTTOM-1', 'open-hole'))).toEqual([REPO_ROOT, 'handbook/structures/open-hole.yaml', 2, 1]);
    // §3.4.3, §3.4.4, §3.14.14: URIs are relative to our base id, which the run declares.
    const bare = toSarif({ handbook, results: fixtureResults(), toolVersion: '0.1.0', uriBase: '' });
    expect(at(find(bare, 'EX-AR-1', 'deep-hole'))).toEqual([REPO_ROOT, 'structures/deep-hole.yaml', 7, 10]);
    expect(Object.keys(bare.runs[0].originalUriBaseIds)).toEqual([REPO_ROOT]);
    expect(bare.runs[0].columnKind).toBe('utf16CodeUnits');
  });

  it('suppresses a waived failure with the waiver (§3.27.23, §3.35); a lapsed waiver suppresses nothing', () => {
    const waived = find(fullLog(), 'EX-AR-1', 'twin-hole');
    expect(waived.suppressions).toEqual([
      {
        kind: 'external',
        status: 'accepted',
        justification: WAIVER.reason,
        location: {
          physicalLocation: { artifactLocation: { uri: 'handbook/waivers/ex-ar-1.yaml', uriBaseId: REPO_ROOT }, region: { startLine: 1, startColumn: 3 } },
          message: { text: 'waiver W-EX-1' },
        },
        properties: { waiver: 'W-EX-1', owner: 'etch module owner', approvedBy: 'design-rule board', expires: '2031-06-30', file: 'waivers/ex-ar-1.yaml', line: 1 },
      },
    ]);
    const lapsedResults = resultsOf(
      fixtureResults().verdicts.map((v): Verdict => (v.status === 'waived' ? { ...v, status: 'fail', waiver: { ...WAIVER, lapsed: 'expired' } } : v)),
    );
    const log = toSarif({ handbook, results: lapsedResults, toolVersion: '0.1.0', uriBase: '' });
    const lapsed = find(log, 'EX-AR-1', 'twin-hole');
    expect(lapsed.suppressions).toBeUndefined();
    expect([lapsed.kind, lapsed.level]).toEqual(['fail', 'error']);
    expect(lapsed.properties.lapsedWaiver).toMatchObject({ waiver: 'W-EX-1', lapsed: 'expired' });
    expect(errorsOf(log)).toEqual([]);
  });

  it('keeps a fingerprint (§3.27.17) when the value changes, and tells rule-structure pairs apart', () => {
    const before = fixtureResults();
    const moved = resultsOf(before.verdicts.map((v): Verdict => (v.rule === 'EX-AR-1' && v.structure === 'deep-hole' ? { ...v, value: 20, margin: (12 - 20) / 12 } : v)));
    const a = toSarif({ handbook, results: before, toolVersion: '0.1.0', uriBase: '' });
    const b = toSarif({ handbook, results: moved, toolVersion: '0.1.0', uriBase: '' });
    expect(find(b, 'EX-AR-1', 'deep-hole').message.text).not.toBe(find(a, 'EX-AR-1', 'deep-hole').message.text);
    expect(b.runs[0].results.map((r) => r.partialFingerprints)).toEqual(a.runs[0].results.map((r) => r.partialFingerprints));
    expect(find(a, 'EX-AR-1', 'deep-hole').partialFingerprints).toEqual({ 'plumblineVerdict/v1': 'EX-AR-1/deep-hole' });
    const keys = a.runs[0].results.map((r) => r.partialFingerprints[FINGERPRINT_KEY]);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it('is deterministic: the same log whatever the order of the verdicts, and no time unless one is given', () => {
    const results = fixtureResults();
    const a = JSON.stringify(toSarif({ handbook, results, toolVersion: '0.1.0', uriBase: '' }));
    const b = JSON.stringify(toSarif({ handbook, results: resultsOf([...results.verdicts].reverse()), toolVersion: '0.1.0', uriBase: '' }));
    expect(b).toBe(a);
    expect(a).not.toMatch(/\d{4}-\d\d-\d\dT\d\d:/);
    expect(fullLog().runs[0].invocations).toEqual([{ executionSuccessful: true, startTimeUtc: '2030-01-02T03:04:05Z' }]);
  });

  it('records the revision (§3.23 needs the repository URI for versionControlProvenance)', () => {
    const log = fullLog();
    expect(log.runs[0].versionControlProvenance).toEqual([
      { repositoryUri: 'https://git.example.invalid/fixture.git', revisionId: '0123456789abcdef0123456789abcdef01234567', mappedTo: { uriBaseId: REPO_ROOT } },
    ]);
    const commitOnly = toSarif({ handbook, results: fixtureResults(), toolVersion: '0.1.0', uriBase: '', revision: { commit: 'abc123' } });
    expect(commitOnly.runs[0].versionControlProvenance).toBeUndefined();
    expect(commitOnly.runs[0].properties.revision).toBe('abc123');
    expect(errorsOf(commitOnly)).toEqual([]);
  });
});

// ---------------------------------------------------------------------------------------------

/** A verdict with only what the baseline comparison reads. */
function verdict(rule: string, structure: string, status: Status, value: number | null): Verdict {
  return { rule, structure, status, severity: 'blocking', quantity: 'geometry.aspect_ratio', unit: '1', comparison: 'at_most', limit: 12, value, margin: value === null ? null : (12 - value) / 12, evaluateAt: 'nominal' };
}

describe('compareWithBaseline (§3.27.24)', () => {
  it('says new, unchanged and updated for current results, and lists the absent ones', () => {
    const current = [
      verdict('A', 's1', 'fail', 16.05263), // baseline 16.0544: both 16.05 to 4 digits (16.053 and 16.054 to 5) → unchanged
      verdict('A', 's2', 'fail', 15), // baseline 15.01: 15.00 against 15.01 → updated
      verdict('A', 's3', 'incomplete', null), // baseline fail → status changed → updated
      verdict('A', 's4', 'incomplete', null), // baseline incomplete, no value either → unchanged
      verdict('B', 's1', 'fail', 13), // baseline pass → new
      verdict('B', 's2', 'waived', 13), // not in the baseline → new
      verdict('B', 's3', 'waived', 13), // baseline fail, same value → status changed → updated
      verdict('C', 's1', 'pass', 11), // baseline fail → absent
      verdict('D', 's1', 'not-applicable', null), // baseline not-applicable: neither is a result
    ];
    const baseline = [
      verdict('A', 's1', 'fail', 16.0544),
      verdict('A', 's2', 'fail', 15.01),
      verdict('A', 's3', 'fail', 14),
      verdict('A', 's4', 'incomplete', null),
      verdict('B', 's1', 'pass', 11),
      verdict('B', 's3', 'fail', 13),
      verdict('C', 's1', 'fail', 12.5),
      verdict('C', 's2', 'waived', 12.5), // gone from the current run → absent
      verdict('D', 's1', 'not-applicable', null),
    ];
    const { states, absent } = compareWithBaseline(current, baseline);
    expect([...states.entries()].sort()).toEqual([
      ['A/s1', 'unchanged'],
      ['A/s2', 'updated'],
      ['A/s3', 'updated'],
      ['A/s4', 'unchanged'],
      ['B/s1', 'new'],
      ['B/s2', 'new'],
      ['B/s3', 'updated'],
    ]);
    expect(absent.map((v) => [v.rule, v.structure, v.status])).toEqual([
      ['C', 's1', 'fail'],
      ['C', 's2', 'waived'],
    ]);
  });

  it('puts a baselineState on every result of the log, and writes absent results from the baseline', () => {
    const results = fixtureResults();
    const now = new Map(results.verdicts.map((v) => [`${v.rule}/${v.structure}`, v]));
    const get = (key: string): Verdict => now.get(key)!;
    const baseline: Verdict[] = [
      get('EX-AR-1/deep-hole'), // same → unchanged
      { ...get('EX-BOTTOM-1/deep-hole'), value: 28e-9 }, // other value → updated
      get('EX-BOTTOM-1/open-hole'), // same incomplete → unchanged
      { ...get('EX-AR-1/twin-hole'), status: 'fail', waiver: undefined }, // failed, now waived → updated
      { ...get('EX-AR-1/open-hole'), status: 'fail', value: 12.5 }, // failed, passes now → absent
      { ...get('EX-SPACE-1/deep-hole'), status: 'pass' }, // passed, fails now → new
    ];
    const log = toSarif({ handbook, results, toolVersion: '0.1.0', uriBase: '', siteUrl: SITE, baseline });
    expect(log.runs[0].results.map((r) => [r.partialFingerprints[FINGERPRINT_KEY], r.baselineState, r.kind, r.level])).toEqual([
      ['EX-AR-1/deep-hole', 'unchanged', 'fail', 'error'],
      ['EX-AR-1/open-hole', 'absent', 'pass', 'none'],
      ['EX-AR-1/twin-hole', 'updated', 'fail', 'error'],
      ['EX-BOTTOM-1/deep-hole', 'updated', 'fail', 'warning'],
      ['EX-BOTTOM-1/open-hole', 'unchanged', 'open', 'none'],
      ['EX-SPACE-1/deep-hole', 'new', 'fail', 'error'],
    ]);
    const gone = find(log, 'EX-AR-1', 'open-hole');
    expect(gone.message.text).toBe('open-hole against EX-AR-1 was fail in the baseline and passes now.');
    expect(gone.properties).toMatchObject({ baselineStatus: 'fail', status: 'pass', value: 12.5 });
    // Placed at the structure as it is now: structures/open-hole.yaml line 2 "id: open-hole", column 1.
    expect(gone.locations[0]?.physicalLocation.region).toEqual({ startLine: 2, startColumn: 1 });
    expect(errorsOf(log)).toEqual([]);
  });
});
