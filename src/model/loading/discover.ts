// Which files of a handbook folder are read, and which are named as left out (hidden, not YAML,
// too deep, misnamed) so nothing is skipped silently.
import { type Diagnostic, type NotLoadedReason, byCodePoint } from '../../diagnostics/diagnostic.ts';
import { HANDBOOK_INPUTS, type HandbookSource, baseName, extName } from '../source.ts';

export const isYamlName = (path: string) => ['.yaml', '.yml'].includes(extName(path).toLowerCase());
export const isHidden = (path: string) => baseName(path).startsWith('.');
/** Deep enough for any sensible grouping; deeper is a link loop. */
export const MAX_FOLDER_DEPTH = 8;

/**
 * The YAML files of `structures/` or `rules/`, subfolders included. Everything else in them is named
 * in a warning, so nothing is left out silently; a YAML name that is not a regular file inside the
 * handbook is kept, and reading it reports why.
 */
export function discover(source: HandbookSource, dir: string, out: Diagnostic[]): string[] {
  const kind = source.kindOf(dir);
  if (kind === 'missing') return [];
  if (kind !== 'folder') {
    out.push({ code: 'not-a-folder', file: dir, line: 1, column: 1, field: '', found: `${dir} must be a folder of YAML files` });
    return [];
  }
  const files: string[] = [];
  const leftOut = (path: string, reason: NotLoadedReason, found: string): void => void out.push({ code: 'not-loaded', file: path, line: 1, column: 1, field: '', reason, found });
  // Folders already walked, by identity: a link back to one (a loop, or a second way in) is not
  // walked again, or every file below it would load twice.
  const seen = new Set<string>();
  const walk = (folder: string, depth: number): void => {
    const id = source.identity?.(folder);
    if (id !== undefined) {
      if (seen.has(id)) return leftOut(folder, 'revisited', '');
      seen.add(id);
    }
    for (const e of source.list(folder)) {
      if (e.problem === 'name-not-utf8') {
        // Not addressable as text, so not readable: an error whatever it is, so nothing in it is lost unseen.
        out.push({ code: 'name-not-utf8', file: e.path, line: 1, column: 1, field: '' });
        continue;
      }
      if (isHidden(e.path)) {
        // Hidden entries are not read. Editor and system litter (.DS_Store, .x.yaml.swp) passes
        // without a word; a hidden YAML file (.draft.yaml, an editor's .#x.yaml lock) is named.
        if (isYamlName(e.path)) leftOut(e.path, 'hidden', '');
        continue;
      }
      if (e.kind === 'folder') {
        if (depth < MAX_FOLDER_DEPTH) walk(e.path, depth + 1);
        else leftOut(e.path, 'too-deep', String(MAX_FOLDER_DEPTH));
      } else if (isYamlName(e.path)) files.push(e.path);
      else if (e.kind === 'file') leftOut(e.path, 'not-yaml', `${dir}/`);
      else leftOut(e.path, 'special', e.what ?? '');
    }
  };
  walk(dir, 1);
  return files.sort(byCodePoint);
}

/** Top-level entries that look meant for us under another spelling (`materials.yml`, `Rules/`). */
export function misnamedTopLevel(source: HandbookSource, out: Diagnostic[]): void {
  const files: string[] = HANDBOOK_INPUTS.filter((n) => n.endsWith('.yaml'));
  const folders: string[] = HANDBOOK_INPUTS.filter((n) => !n.endsWith('.yaml'));
  for (const e of source.list('')) {
    const name = baseName(e.path);
    const lower = name.toLowerCase();
    if (files.includes(name) || folders.includes(name)) continue;
    const file = files.find((w) => lower === w || lower === w.replace(/\.yaml$/, '.yml'));
    const folder = folders.find((w) => lower === w || lower === w.replace(/s$/, ''));
    if (file) out.push({ code: 'not-loaded', file: e.path, line: 1, column: 1, field: '', reason: 'misnamed-file', found: file });
    else if (folder && e.kind === 'folder') out.push({ code: 'not-loaded', file: e.path, line: 1, column: 1, field: '', reason: 'misnamed-folder', found: `${folder}/` });
  }
}
