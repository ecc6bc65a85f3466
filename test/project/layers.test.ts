// The pipeline's direction, enforced on the imports: model → engines → checker → history → report
// → cli (history walks git into rows the report renders). A layer may import from layers below
// it, never from one above; pipeline.ts (load + evaluate) sits between the checker and history.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const SRC = resolve(import.meta.dirname, '../../src');

/** What each folder of src/ may import from (besides itself and packages). */
const MAY_IMPORT: Record<string, string[]> = {
  diagnostics: [],
  types: [],
  model: ['diagnostics'],
  engines: ['model', 'diagnostics'],
  checker: ['engines', 'model', 'diagnostics'],
  history: ['pipeline', 'checker', 'engines', 'model', 'diagnostics'],
  report: ['history', 'checker', 'engines', 'model', 'diagnostics', 'types'],
  cli: ['pipeline', 'history', 'report', 'checker', 'engines', 'model', 'diagnostics', 'exit-codes'],
};

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((e) => {
    const p = join(dir, e);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

describe('layers', () => {
  it('no module imports from a layer above its own', () => {
    const against: string[] = [];
    for (const file of files(SRC)) {
      const layer = relative(SRC, file).split('/')[0]!.replace(/\.ts$/, '');
      const allowed = MAY_IMPORT[layer];
      if (!allowed) continue; // top-level entry points (pipeline.ts, exit-codes.ts)
      for (const m of readFileSync(file, 'utf8').matchAll(/^import[^'"]*['"]([^'"]+)['"]/gm)) {
        const spec = m[1]!;
        if (!spec.startsWith('.')) continue;
        const target = relative(SRC, resolve(join(file, '..'), spec)).split('/')[0]!.replace(/\.ts$/, '');
        if (target !== layer && !allowed.includes(target)) against.push(`${relative(SRC, file)} → ${spec}`);
      }
    }
    expect(against).toEqual([]);
  });
});
