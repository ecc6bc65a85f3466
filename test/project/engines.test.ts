// "npm install on the Node the README states" must not warn: every installed package's engines
// range has to admit the oldest Node our own package.json accepts, and the README must state that
// version. (A regression test for vega-lite 6.5 and katex 0.18.5+, which need Node 22.)
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import semver from 'semver';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(import.meta.dirname, '../..');
const pkg = JSON.parse(readFileSync(resolve(ROOT, 'package.json'), 'utf8')) as { engines: { node: string } };
const lock = JSON.parse(readFileSync(resolve(ROOT, 'package-lock.json'), 'utf8')) as {
  packages: Record<string, { engines?: { node?: string } | string[]; optional?: boolean }>;
};

describe('Node version', () => {
  const oldest = semver.minVersion(pkg.engines.node)!;

  it('every locked package accepts the oldest Node that package.json allows', () => {
    const refusing = Object.entries(lock.packages)
      .filter(([path]) => path !== '')
      .flatMap(([path, p]) => {
        const range = !Array.isArray(p.engines) ? p.engines?.node : undefined;
        return range && !semver.satisfies(oldest, range) ? [`${path.replace(/^node_modules\//, '')} needs ${range}`] : [];
      });
    expect(refusing).toEqual([]);
  });

  it('the README states the same oldest version (major and minor)', () => {
    const readme = readFileSync(resolve(ROOT, 'README.md'), 'utf8');
    expect(readme).toContain(`Node.js ${oldest.major}.${oldest.minor}`);
  });
});
