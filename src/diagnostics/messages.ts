// The one catalogue of sentences about handbook problems. Tests assert codes and fields, so
// rewording here never breaks a test.
import { isWarning, type Diagnostic, type NotLoadedReason } from './diagnostic.ts';
import type { RefusalCode, RefusalFacts } from './refusal.ts';

const headline: Record<Diagnostic['code'], (d: Diagnostic) => string> = {
  'yaml-syntax': (d) => `YAML syntax error: ${d.found ?? ''}`,
  'file-unreadable': (d) => `cannot read the file: ${d.found ?? ''}`,
  'unknown-field': (d) => `unknown field "${lastSegment(d.field)}"`,
  'missing-field': (d) => `missing required field "${lastSegment(d.field)}"`,
  'wrong-type': () => `wrong type`,
  'bad-value': () => `value not allowed`,
  'unknown-kind': (d) => `unknown structure kind ${quote(d.found)}`,
  'duplicate-id': (d) => `duplicate id ${quote(d.found)}`,
  'id-not-url-safe': (d) => `id ${quote(d.found)} cannot be used in a URL`,
  'wrong-dimension': () => `unit of the wrong dimension`,
  'malformed-quantity': () => `not a number with a unit`,
  'malformed-tolerance': () => `malformed tolerance`,
  'unknown-quantity': (d) => `no engine provides the quantity ${quote(d.found)}`,
  'unknown-material': (d) => `unknown material ${quote(d.found)}`,
  'unknown-unit': () => `unknown unit`,
  'offset-unit': () => `a temperature difference cannot be written in a unit with an offset`,
  'id-too-long': () => `id too long`,
  'relation-at-tolerance': () => `values can contradict each other within their tolerances`,
  'no-handbook': () => `no handbook found`,
  'unknown-rule': (d) => `no rule ${quote(d.found)} in this handbook`,
  'bad-date': () => `not a calendar date`,
  'floor-stricter-than-rule': () => `a waiver may only loosen the rule's limit, never tighten it`,
  'not-a-folder': (d) => `not a folder: ${d.found ?? ''}`,
  'not-a-regular-file': (d) => `not read: ${d.found ?? 'not a regular file'}`,
  'outside-handbook': (d) => `not read: ${d.found ?? 'outside the handbook'}`,
  'file-too-large': (d) => `not read: the file is too large (${d.found ?? ''})`,
  'not-utf8': (d) => `not UTF-8 text (${d.found ?? ''}); save the file as UTF-8`,
  'name-not-utf8': () => `not read: its name is not UTF-8 (shown with \\x escapes); rename it`,
  'not-loaded': (d) => `not loaded: ${NOT_LOADED[d.reason ?? 'special'](d.found ?? '')}`,
};

/** Why an entry of the handbook folders was left out; `found` holds the fact (a kind, a name). */
const NOT_LOADED: Record<NotLoadedReason, (found: string) => string> = {
  'not-yaml': (f) => `only .yaml and .yml files are read in ${f}`,
  hidden: () => 'hidden files (names starting with a dot) are not read',
  special: (f) => `${f || 'not a regular file'}, which is not read`,
  revisited: () => 'a link to a folder that is read already (through another path)',
  'too-deep': (f) => `folders nested more than ${f} deep are not read`,
  'misnamed-file': (f) => `the file is read only when named ${f}`,
  'misnamed-folder': (f) => `the folder is read only when named ${f}`,
};

/** Longest text quoted back from a handbook file: enough to recognise it, never the whole file. */
export const MAX_QUOTE = 80;

/** Shorten a quoted value to MAX_QUOTE characters, on one line. */
export function excerpt(s: string): string {
  const oneLine = s.replace(/\r?\n/g, '⏎');
  const chars = [...oneLine];
  return chars.length <= MAX_QUOTE ? oneLine : `${chars.slice(0, MAX_QUOTE - 1).join('')}… (${chars.length} characters)`;
}

/** Codes whose headline already quotes what was found. */
const SAYS_FOUND = new Set<Diagnostic['code']>(['yaml-syntax', 'file-unreadable', 'unknown-kind', 'duplicate-id', 'id-not-url-safe', 'unknown-quantity', 'unknown-material', 'unknown-rule', 'not-a-folder', 'not-a-regular-file', 'outside-handbook', 'file-too-large', 'not-utf8', 'not-loaded']);

function quote(s: string | undefined): string {
  return s === undefined ? '' : `"${excerpt(s)}"`;
}
function lastSegment(path: string): string {
  const parts = path.split('.');
  return parts[parts.length - 1] ?? path;
}

/** One-line sentence for a diagnostic, without its position. */
export function describeDiagnostic(d: Diagnostic): string {
  const parts = [headline[d.code](d)];
  if (d.expected !== undefined) parts.push(`expected ${d.expected}`);
  if (d.found !== undefined && !SAYS_FOUND.has(d.code)) parts.push(`found ${excerpt(d.found)}`);
  if (d.other) parts.push(`also defined at ${d.other.file}:${d.other.line}:${d.other.column}`);
  if (d.suggestions && d.suggestions.length > 0) parts.push(`did you mean ${d.suggestions.map((s) => `"${s}"`).join(', ')}?`);
  return parts.join('; ');
}

/** `file:line:column field: sentence` — the form editors and terminals link. */
export function formatDiagnostic(d: Diagnostic): string {
  const field = d.field ? ` ${d.field}:` : '';
  // A file of a revision is named as git names it: `abc1234:structures/x.yaml`.
  return `${d.revision ? `${d.revision}:` : ''}${d.file}:${d.line}:${d.column}${isWarning(d) ? ' warning:' : ''}${field} ${describeDiagnostic(d)}`;
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** What a command did not do because the handbook did not load. */
export type Consequence = 'nothing was checked' | 'nothing was written' | 'the last good report is still served';

/** A handbook that did not load: every problem, then what happened. */
export function formatDiagnostics(list: Diagnostic[], consequence: Consequence = 'nothing was checked'): string {
  const errors = list.filter((d) => !isWarning(d)).length;
  const warnings = list.length - errors;
  return `${list.map(formatDiagnostic).join('\n')}\n${plural(errors, 'problem')}${warnings ? ` and ${plural(warnings, 'warning')}` : ''} in the handbook; ${consequence}.`;
}

/** Warnings of a handbook that loaded (printed on stderr before a command's own output). */
export function formatWarnings(list: Diagnostic[]): string {
  return `${list.map(formatDiagnostic).join('\n')}\n${plural(list.length, 'warning')}: the handbook loaded without ${list.length === 1 ? 'it' : 'them'}.`;
}

const MARKER_NAME = '.plumbline-report';

/** Why a command stopped without changing anything (see refusal.ts). */
const refusal: Record<RefusalCode, (f: RefusalFacts) => string> = {
  'output-is-handbook': (f) => `the output folder ${f.path} is the handbook folder itself; building there would replace the handbook. Choose another --out (the default is site/ inside the handbook).`,
  'output-holds-handbook': (f) => `the output folder ${f.path} contains the handbook (${f.root}); building there would replace it. Choose a folder beside or inside the handbook, such as site/.`,
  'output-inside-inputs': (f) => `the output folder ${f.path} lies inside the handbook's ${f.input}; the report would be mixed with the handbook's files. Choose another --out, such as site/.`,
  'output-is-link': (f) => `the output folder ${f.path} is a symbolic link; plumbline replaces only real folders it wrote. Give the folder the link points to, or remove the link.`,
  'output-is-file': (f) => `the output path ${f.path} is a file, not a report folder; plumbline will not replace it.`,
  'output-not-ours': (f) => `the folder ${f.path} exists and is not a report plumbline wrote (it has no ${MARKER_NAME} file); plumbline will not replace it. Choose an empty or new --out, or remove the folder yourself if it is an old report.`,
  'output-has-foreign-files': (f) => `the report folder ${f.path} holds ${f.fileCount === 1 ? 'a file' : `${f.fileCount} files`} plumbline did not write (${(f.files ?? []).join(', ')}${(f.fileCount ?? 0) > (f.files ?? []).length ? ', …' : ''}); a new build would delete ${f.fileCount === 1 ? 'it' : 'them'}. Move ${f.fileCount === 1 ? 'it' : 'them'} out of the report folder, or build into another --out.`,
  'output-changed': (f) => `the output folder ${f.path} changed while the report was being built (it is no longer empty or a report plumbline wrote); it was left as it is. Build again, or choose another --out.`,
  'output-is-mount': (f) => `the output folder ${f.path} cannot be replaced by renaming it (${f.errno === 'a mount point' ? 'it is a mount point, such as a container volume' : `${f.errno}: a mount point, such as a container volume?`}); build into a folder inside it instead, such as ${f.path}/site.`,
  'output-name-reserved': (f) => `the output folder ${f.path} is named like the lock or a temporary folder of another report's builds, and would be removed as one; choose another name.`,
  'lock-foreign': (f) => `${f.lock} exists and is not a lock plumbline wrote; remove it (or rename it) and build again.`,
  'lock-held': (f) => `another build holds ${f.lock}: ${f.holder}. If no such build is running, delete that file and try again.`,
  'lock-unavailable': (f) => `cannot create the lock ${f.lock}: ${f.reason ?? ''}`,
  'port-in-use': (f) => `port ${f.port} is already in use on 127.0.0.1; stop what is using it or choose another with --port`,
  'port-forbidden': (f) => `port ${f.port} may not be used by this user; choose one above 1023 with --port`,
  'port-unavailable': (f) => `cannot listen on 127.0.0.1:${f.port}: ${f.reason ?? ''}`,
  'file-not-ours': (f) => `${f.path} exists and is ${f.reason}; plumbline replaces only a file it wrote, so it was left as it is. Move it away, or name another file.`,
  'file-write-failed': (f) => `${f.path} could not be written (${f.errno}); the file there before, if any, is untouched.`,
  'baseline-unloadable': (f) => `${f.reason}, so it cannot be the baseline; nothing was written.`,
  'not-a-repository': (f) => `${f.reason}; history, diff and --baseline read the handbook's git repository (run \`git init\` and commit the handbook first).`,
  'unknown-revision': (f) => `${f.reason}; name a commit, a branch or a tag (\`git log --oneline\` lists them).`,
  'git-missing': () => `the git program was not found on PATH; history, diff and --baseline run it to read revisions.`,
  'git-failed': (f) => `git failed: ${f.reason}`,
  'write-failed': (f) => `the report could not be written: ${f.reason} (${f.errno}${f.path ? ` at ${f.path}` : ''}); the previous report, if any, is untouched`,
  'scaffold-target-taken': (f) =>
    f.reason
      ? `${f.path} ${f.reason}, so no handbook can be started there; nothing was written. Give a new or empty folder.`
      : `${f.path} already holds ${(f.files ?? []).join(', ')}${(f.fileCount ?? 0) > (f.files ?? []).length ? ', …' : ''}; init never replaces a file or writes into an existing handbook, so nothing was written. Give a new or empty folder, or move ${f.fileCount === 1 ? 'it' : 'them'} aside.`,
  'scaffold-write-failed': (f) => `the new handbook could not be written: ${f.reason} (${f.errno}${f.path ? ` at ${f.path}` : ''}); ${f.files && f.files.length ? `written before the failure and left in place: ${f.files.join(', ')}` : 'nothing was written'}.`,
};

export function describeRefusal(code: RefusalCode, facts: RefusalFacts): string {
  return refusal[code](facts);
}
