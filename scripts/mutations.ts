// Mutation check: does the suite bite? Each entry is a deliberately wrong edit to the safety and
// loading code; applying it must make at least one of the named test files fail. Run it with
// `npm run mutations` (a few minutes: one vitest run per mutation). The source is restored after
// each run, also when interrupted.
//
//   node --import tsx scripts/mutations.ts [filter]
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';

interface Mutation {
  name: string;
  file: string;
  from: string;
  to: string;
  /** A second edit in the same file, for checks that stand in two layers. */
  also?: [string, string];
  tests: string[];
}

const M: Mutation[] = [
  { name: 'build may replace the handbook folder itself', file: 'src/report/publish.ts', from: 'if (realOut === realRoot) throw', to: 'if (false) throw', tests: ['test/report/publish.test.ts'] },
  { name: 'build may replace a folder above the handbook', file: 'src/report/publish.ts', from: 'if (isInside(realOut, realRoot)) throw', to: 'if (false) throw', tests: ['test/report/publish.test.ts'] },
  { name: 'any non-empty folder counts as ours', file: 'src/report/publish.ts', from: "if (readdirSync(absOut).length === 0) return;", to: 'return;', tests: ['test/report/publish.test.ts'] },
  { name: 'links are followed as output folders', file: 'src/report/publish.ts', from: 'if (st.isSymbolicLink()) throw', to: 'if (false) throw', tests: ['test/report/publish.test.ts'] },
  { name: 'recovery prefers the old report to the complete new one', file: 'src/report/publish.ts', from: "complete('building') ?? complete('previous')", to: "complete('previous') ?? complete('building')", tests: ['test/report/publish.test.ts'] },
  { name: 'leftovers without our marker are deleted too', file: 'src/report/publish.ts', from: 'if (isOurs(f)) {', to: 'if (true) {', tests: ['test/report/publish.test.ts'] },
  { name: 'a live lock holder is taken over', file: 'src/report/publish.ts', from: 'if (!alive(h.pid)) return true;', to: 'return true;', tests: ['test/report/publish.test.ts'] },
  { name: 'builds do not wait for each other', file: 'src/report/publish.ts', from: 'if (isStale(path, holder, me)) {', to: 'if (true) {', tests: ['test/report/publish.test.ts'] },
  { name: 'files added to a report by hand are deleted with it', file: 'src/report/publish.ts', from: 'if (foreign.length) throw', to: 'if (false) throw', tests: ['test/report/publish.test.ts'] },
  { name: 'what appears in the output during the render is deleted', file: 'src/report/publish.ts', from: '      guardOutput(target, root); // and again', to: '      // and again', also: ['if (!holdsOnlyOurs(previous)) {', 'if (false) {'], tests: ['test/report/publish.test.ts'] },
  { name: 'a lock left with our own pid is waited for', file: 'src/report/publish.ts', from: 'if (h.pid === process.pid) return !heldHere.has(h.token);', to: '', tests: ['test/report/publish.test.ts'] },
  { name: 'an old lock of another host is never taken over', file: 'src/report/publish.ts', from: 'if (age > LOCK_STALE_MS) return true;', to: '', tests: ['test/report/publish.test.ts'] },
  { name: 'serve answers any Host (DNS rebinding)', file: 'src/report/serve.ts', from: "if (!allowedHosts.has((req.headers.host ?? '').toLowerCase())) return", to: 'if (false) return', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'containment by a bare prefix', file: 'src/model/folder-source.ts', from: "return rel === '' || (!rel.startsWith(`..${sep}`) && rel !== '..' && !isAbsolute(rel));", to: 'return child.startsWith(parent);', tests: ['test/model/folder-source.test.ts', 'test/cli/serve-safety.test.ts'] },
  { name: 'a folder reached twice through links is read twice', file: 'src/model/load.ts', from: "if (seen.has(id)) return leftOut(folder, 'revisited', '');", to: '', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'eval FILE names the bare file name', file: 'src/model/folder-source.ts', from: 'this.file = shownAs;', to: 'this.file = this.name;', tests: ['test/cli/refusals.test.ts'] },
  { name: 'images climbing with .. count as inside the report', file: 'src/report/markdown.ts', from: "return !path.split('/').some((seg) => seg === '..');", to: 'return true;', tests: ['test/report/markdown.test.ts'] },
  { name: 'kept images lose their alternative text', file: 'src/report/markdown.ts', from: 'if (isInsideReport(src)) return keptImage(tokens, idx, _options, _env, self);', to: 'if (isInsideReport(src)) return self.renderToken(tokens, idx, _options);', tests: ['test/report/markdown.test.ts'] },
  { name: 'serve accepts dot segments', file: 'src/report/serve.ts', from: "if (seg === '.' || seg === '..') return { status: 400 };", to: '', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'serve accepts encoded slashes', file: 'src/report/serve.ts', from: "if (seg.includes('/') || seg.includes('\\\\') || seg.includes('\\0')) return { status: 400 };", to: '', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'serve follows links out of the report', file: 'src/report/serve.ts', from: 'if (!isInside(rootReal, real)) return { status: 404 };\n    if (statSync', to: 'if (statSync', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'serve lets a malformed escape throw', file: 'src/report/serve.ts', from: 'return { status: 400 }; // a malformed escape', to: 'throw new URIError("x"); // a malformed escape', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'serve gives out dotfiles', file: 'src/report/serve.ts', from: "if (seg.startsWith('.')) return { status: 404 };", to: '', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'loading follows links out of the handbook', file: 'src/model/folder-source.ts', from: "if (!isInside(this.realRoot, real)) return { kind: 'other'", to: "if (false) return { kind: 'other'", tests: ['test/corpus/corpus.test.ts'] },
  { name: 'loading reads FIFOs and devices (both the listing check and the check on the open file)', file: 'src/model/folder-source.ts', from: "return { kind: 'other', what: describeStat(st), problem: 'not-a-regular-file' };", to: "return { kind: 'file', real };", also: ["if (!st.isFile()) return { ok: false, problem: { code: 'not-a-regular-file'", "if (false) return { ok: false, problem: { code: 'not-a-regular-file'"], tests: ['test/corpus/corpus.test.ts', 'test/cli/refusals.test.ts'] },
  { name: 'no size limit (neither before nor while reading)', file: 'src/model/folder-source.ts', from: 'if (st.size > MAX_FILE_BYTES)', to: 'if (false)', also: ['if (n > MAX_FILE_BYTES)', 'if (false)'], tests: ['test/corpus/corpus.test.ts'] },
  { name: 'bytes that are not UTF-8 become U+FFFD', file: 'src/model/source.ts', from: "fatal: true, ignoreBOM: true", to: "fatal: false, ignoreBOM: true", tests: ['test/model/regressions.test.ts', 'test/corpus/corpus.test.ts'] },
  { name: 'a byte-order mark is kept', file: 'src/model/source.ts', from: 'bytes[2] === 0xbf ? 3 : 0', to: 'bytes[2] === 0xbf ? 0 : 0', tests: ['test/model/regressions.test.ts'] },
  { name: 'offset units allowed for a difference', file: 'src/model/units.ts', from: "if (offsetScale(nominalText)) return { code: 'offset-unit'", to: "if (false) return { code: 'offset-unit'", tests: ['test/model/regressions.test.ts'] },
  { name: 'a tolerance in degC converted as an absolute temperature', file: 'src/model/units.ts', from: 'return clean(v - Number(zero));', to: 'return v;', tests: ['test/model/regressions.test.ts'] },
  { name: 'a reversed tolerance is read as something else', file: 'src/model/units.ts', from: 'const reversed = REVERSED.exec(text);', to: 'const reversed = null as RegExpExecArray | null;', tests: ['test/model/regressions.test.ts'] },
  { name: 'a material property loses its tolerance where used', file: 'src/model/load.ts', from: '...(mp.low !== undefined && mp.high !== undefined ? { low: mp.low, high: mp.high } : {}),', to: '', tests: ['test/model/regressions.test.ts'] },
  { name: 'relations checked at nominal only', file: 'src/model/relations.ts', from: 'for (let mask = 0; mask < 1 << tol.length; mask++) {', to: 'for (let mask = 0; mask < 0; mask++) {', tests: ['test/model/regressions.test.ts', 'test/corpus/corpus.test.ts'] },
  { name: 'duplicate material ids accepted', file: 'src/model/load.ts', from: '  checkDuplicates(ids, out);\n  return { materials', to: '  return { materials', tests: ['test/model/regressions.test.ts'] },
  { name: 'follow-on errors reported', file: 'src/model/load.ts', from: 'return sortDiagnostics(out.filter((d) => !isConsequence(d, broken)));', to: 'return sortDiagnostics(out);', tests: ['test/model/regressions.test.ts', 'test/corpus/corpus.test.ts'] },
  { name: 'a field’s problem said as often as it is met', file: 'src/model/load.ts', from: 'if (this.said.has(key)) return;', to: '', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'non-YAML files in structures/ ignored without a word', file: 'src/model/load.ts', from: "else if (e.kind === 'file') leftOut(e.path, 'not-yaml', `${dir}/`);", to: "else if (e.kind === 'file') void 0;", tests: ['test/model/regressions.test.ts', 'test/corpus/corpus.test.ts'] },
  { name: 'ids of any length', file: 'src/model/schema.ts', from: 'export const MAX_ID_LENGTH = 64;', to: 'export const MAX_ID_LENGTH = 6400;', tests: ['test/model/regressions.test.ts'] },
  { name: 'messages quote whole values', file: 'src/diagnostics/messages.ts', from: 'export const MAX_QUOTE = 80;', to: 'export const MAX_QUOTE = 1e9;', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'remote markdown images rendered as images', file: 'src/report/markdown.ts', from: 'if (isInsideReport(src)) return keptImage(', to: 'if (true) return keptImage(', tests: ['test/browser/report.browser.test.ts'] },
  { name: 'protocol-relative images count as inside the report', file: 'src/report/markdown.ts', from: "if (s.startsWith('/') || s.includes('\\\\')) return false;", to: '', tests: ['test/browser/report.browser.test.ts'] },
  { name: 'pages without a content security policy', file: 'templates/_layouts/base.njk', from: '<meta http-equiv="Content-Security-Policy" content="{{ report.contentSecurityPolicy }}">', to: '', tests: ['test/browser/report.browser.test.ts'] },
  { name: 'long words widen the page', file: 'templates/style.css.njk', from: 'body { margin: 0; overflow-wrap: anywhere; }', to: 'body { margin: 0; }', tests: ['test/browser/report.browser.test.ts'] },
  { name: 'a film that closes its opening still has a coverage', file: 'src/engines/deposition/index.ts', from: 'if (!(narrowest - narrowed - 2 * own > 1e-9 * narrowest)) {', to: 'if (false) {', tests: ['test/engines/deposition.test.ts'] },
  { name: 'cell dielectrics that meet across the gap still give a capacitance', file: 'src/engines/electrical/index.ts', from: "if (surfaces.includes('outer') && !room(", to: "if (false && !room(", tests: ['test/engines/electrical.test.ts'] },
  { name: 'a cell dielectric that fills the cup gives a capacitance', file: 'src/engines/electrical/index.ts', from: "if ((surfaces.includes('inner') || surfaces.includes('bottom')) && !room(", to: "if (false && !room(", tests: ['test/engines/electrical.test.ts'] },
  { name: 'a percentage of a percentage read one way silently', file: 'src/model/units.ts', from: "if (/%\\s*$/.test(nominalText.trim())) return", to: 'if (false) return', tests: ['test/model/units.test.ts'] },
  { name: 'a file named like the lock is removed', file: 'src/report/publish.ts', from: "if (!holder) throw new Refusal('lock-foreign', { lock: path });", to: 'if (!holder) { rmSync(path, { recursive: true, force: true }); continue; }', tests: ['test/report/publish.test.ts'] },
  { name: 'a mount point is renamed away (both the early check and the rename error)', file: 'src/report/publish.ts', from: 'if (st.dev !== statSync(dirname(absOut)).dev) throw', to: 'if (false) throw', also: ["if (code === 'EBUSY' || code === 'EXDEV') throw", 'if (false) throw'], tests: ['test/report/publish.test.ts'] },
  { name: 'output through a file crashes', file: 'src/report/publish.ts', from: "if (!statSync(up).isDirectory()) throw new Refusal('output-is-file', { path: up });", to: '', also: ["if ((err as NodeJS.ErrnoException).code === 'ENOTDIR') throw new Refusal('output-is-file', { path: up });", ''], tests: ['test/report/publish.test.ts'] },
  { name: 'a report is deleted marker first', file: 'src/report/publish.ts', from: 'for (const name of readdirSync(dir)) if (name !== MARKER) rmSync', to: 'rmSync(join(dir, MARKER), { force: true });\n  for (const name of readdirSync(dir)) if (name !== MARKER) rmSync', tests: ['test/report/publish.test.ts'] },
  { name: 'a lock of another pid namespace is judged by its pid here', file: 'src/report/publish.ts', from: 'if (h.pidNamespace !== me.pidNamespace) return false;', to: '', tests: ['test/report/publish.test.ts'] },
  { name: 'a build publishes a folder removed and re-made under it', file: 'src/report/publish.ts', from: "if (still.state !== 'building' || still.build !== token) throw", to: 'if (false) throw', tests: ['test/report/publish.test.ts'] },
  { name: 'names that are not UTF-8 are skipped', file: 'src/model/load.ts', from: "out.push({ code: 'name-not-utf8', file: e.path, line: 1, column: 1, field: '' });", to: '', tests: ['test/model/regressions.test.ts'] },
  { name: 'a liner filling the via bottom still gives a capacitance', file: 'src/engines/electrical/index.ts', from: 'if (narrowest > liner * (1 + 1e-9)) return null;', to: 'return null;', tests: ['test/engines/electrical.test.ts'] },
  { name: 'the cup is judged at its top radius only', file: 'src/engines/electrical/index.ts', from: 'ri = Math.min(c.top, c.bottom) / 2;', to: '', tests: ['test/engines/electrical.test.ts'] },
  { name: 'calibration above the open rate is fitted', file: 'src/engines/etch/index.ts', from: 'if (points.some((p) => p.rate > a.rate!)) return noValue(', to: 'if (false) return noValue(', tests: ['test/engines/etch.test.ts'] },
  { name: 'a fit pinned at its edge is a value', file: 'src/engines/etch/index.ts', from: 'if (s < 1.01e-6) return noValue(', to: 'if (false) return noValue(', tests: ['test/engines/etch.test.ts'] },
  { name: 'trenches shorter than wide accepted', file: 'src/model/relations.ts', from: 'holds: ([length, cd]) => length! > cd!', to: 'holds: () => true', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'output names of leftovers accepted', file: 'src/report/publish.ts', from: "throw new Refusal('output-name-reserved', { path: absOut });", to: '', tests: ['test/report/publish.test.ts'] },
  { name: 'inputs compared without following their links', file: 'src/report/publish.ts', from: '|| isInside(realish(at), realOut)', to: '', tests: ['test/report/publish.test.ts'] },
  { name: 'serve builds before it listens', file: 'src/report/serve.ts', from: '  const actual = await listen(server, port);', to: '  await rebuild();\n  const actual = await listen(server, port);', tests: ['test/cli/serve-safety.test.ts'] },
  { name: 'a waiver lapses on its last day (expiry off by one)', file: 'src/checker/evaluate.ts', from: "if (on > w.expires) return 'expired';", to: "if (on >= w.expires) return 'expired';", tests: ['test/checker/waivers.test.ts'] },
  { name: 'a waiver never expires', file: 'src/checker/evaluate.ts', from: "if (on > w.expires) return 'expired';", to: "if (false) return 'expired';", tests: ['test/checker/waivers.test.ts'] },
  { name: 'a waiver excuses a value beyond its still_within', file: 'src/checker/evaluate.ts', from: "if (!within) return 'beyond-floor';", to: '', tests: ['test/checker/waivers.test.ts'] },
  { name: 'a waiver turns a pass or an incomplete into waived', file: 'src/checker/evaluate.ts', from: "if (v.status !== 'fail') return v;", to: "if (v.status === 'not-applicable') return v;", tests: ['test/checker/waivers.test.ts'] },
  { name: 'a waiver waives its rule on every structure', file: 'src/checker/evaluate.ts', from: 'waivers.filter((w) => w.rule === v.rule && appliesTo(w, s))', to: 'waivers.filter((w) => w.rule === v.rule)', tests: ['test/checker/waivers.test.ts'] },
  { name: 'waived verdicts count as blocking failures', file: 'src/checker/evaluate.ts', from: "if (v.status === 'fail' && v.severity === 'blocking') blockingFailures++;", to: "if ((v.status === 'fail' || v.status === 'waived') && v.severity === 'blocking') blockingFailures++;", tests: ['test/checker/waivers.test.ts'] },
  { name: 'a waiver date that is no day of the calendar accepted', file: 'src/model/load.ts', from: "if ('date' in d) expires = d.date;", to: 'if (true) expires = raw.expires;', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'waiver dates: every century year a leap year', file: 'src/model/calendar.ts', from: 'year % 100 !== 0', to: 'true', tests: ['test/model/waivers.test.ts'] },
  { name: 'a waiver floor stricter than its rule accepted', file: 'src/model/load.ts', from: 'if (stricter) {', to: 'if (false) {', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'a waiver naming a rule that failed to load is reported again', file: 'src/model/load.ts', from: "if (r.kind === 'rule') return broken.anyRule || broken.rules.has(r.id);", to: '', tests: ['test/corpus/corpus.test.ts'] },
  { name: 'waivers/ is not read', file: 'src/model/load.ts', from: "const waiverFiles = discover(source, 'waivers', out);", to: 'const waiverFiles: string[] = [];', tests: ['test/corpus/corpus.test.ts', 'test/model/waivers.test.ts'] },
  { name: 'the waived matrix cell has no look of its own (colour and dashed frame)', file: 'templates/style.css.njk', from: '.c-waived { background: var(--waived-bg); color: var(--waived); font-weight: 600; }', to: '', also: ['td.cell.c-waived a { border: 1px dashed var(--waived); }', ''], tests: ['test/browser/report.browser.test.ts'] },
  { name: 'a file plumbline did not write is replaced (ledger, SARIF)', file: 'src/history/own-file.ts', from: "if (!isOurs(old)) throw new Refusal('file-not-ours'", to: "if (false) throw new Refusal('file-not-ours'", tests: ['test/history/ledger.test.ts', 'test/history/diff.test.ts'] },
  { name: 'a link is written through (ledger, SARIF)', file: 'src/history/own-file.ts', from: "if (!st.isFile()) throw new Refusal('file-not-ours'", to: "if (false) throw new Refusal('file-not-ours'", tests: ['test/history/ledger.test.ts'] },
  { name: 'a revision named like an option reaches git', file: 'src/history/git.ts', from: "if (rev.startsWith('-')) throw gitProblem(", to: "if (false) throw gitProblem(", also: ["'--verify', '--quiet', '--end-of-options', `${rev}^{commit}`", "'--verify', '--quiet', `${rev}^{commit}`"], tests: ['test/history/diff.test.ts'] },
  { name: 'a committed link is read in a revision', file: 'src/model/revision-source.ts', from: "if (e.kind === 'other') return { ok: false", to: "if (false) return { ok: false", tests: ['test/history/diff.test.ts'] },
  { name: 'a repository from a hook\'s GIT_DIR is read instead of the handbook\'s', file: 'src/history/git.ts', from: '      env: gitEnv(),', to: '      env: process.env,', tests: ['test/history/history.test.ts'] },
  { name: 'a closed opening gives an infinite ALD exposure', file: 'src/engines/deposition/index.ts', from: "return 'reason' in o ? noValue(o.reason) : compute(a, step.method, elongated);", to: "return 'reason' in o ? Infinity : compute(a, step.method, elongated);", tests: ['test/property/engines.property.test.ts'] },
];

const ROOT = resolve(import.meta.dirname, '..');
const filter = process.argv[2];
const survivors: string[] = [];
for (const m of M.filter((x) => !filter || x.name.includes(filter))) {
  const path = resolve(ROOT, m.file);
  const original = readFileSync(path, 'utf8');
  if (!original.includes(m.from) || (m.also && !original.includes(m.also[0]))) {
    survivors.push(`${m.name}: the text to mutate is no longer in ${m.file} (update the mutation)`);
    continue;
  }
  const restore = () => writeFileSync(path, original);
  const onInterrupt = () => (restore(), process.exit(130));
  process.once('SIGINT', onInterrupt);
  let mutated = original.replace(m.from, m.to);
  if (m.also) mutated = mutated.replace(m.also[0], m.also[1]);
  writeFileSync(path, mutated);
  let killed = false;
  try {
    execFileSync('npx', ['vitest', 'run', ...m.tests], { cwd: ROOT, stdio: 'ignore' });
  } catch {
    killed = true;
  } finally {
    restore();
    process.off('SIGINT', onInterrupt);
  }
  console.log(`${killed ? 'killed  ' : 'SURVIVED'} ${m.name}`);
  if (!killed) survivors.push(m.name);
}
if (survivors.length) {
  console.log(`\n${survivors.length} mutation(s) survived:\n- ${survivors.join('\n- ')}`);
  process.exitCode = 1;
} else console.log('\nevery mutation was caught');
