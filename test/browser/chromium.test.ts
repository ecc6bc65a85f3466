// The order in which the browser tests pick a chromium (the README promises it): the variable,
// then a system chromium, then the one packaged in node_modules; never a download.
import { describe, expect, it } from 'vitest';
import { chooseChromium } from './chromium.ts';

const only = (...paths: string[]) => (p: string) => paths.includes(p);

describe('choosing a chromium for the browser tests', () => {
  it('takes PLUMBLINE_CHROMIUM first, even when a system chromium exists', () => {
    expect(chooseChromium({ PLUMBLINE_CHROMIUM: '/opt/c/chrome' }, only('/opt/c/chrome', '/usr/bin/chromium'))).toEqual({ from: 'PLUMBLINE_CHROMIUM', path: '/opt/c/chrome' });
  });

  it('refuses a PLUMBLINE_CHROMIUM that names no file rather than silently using another', () => {
    expect(chooseChromium({ PLUMBLINE_CHROMIUM: '/nowhere/chrome' }, only('/usr/bin/chromium')).from).toBe('none');
  });

  it("uses Debian's chromium when the variable is not set", () => {
    expect(chooseChromium({}, only('/usr/bin/chromium'))).toEqual({ from: 'system', path: '/usr/bin/chromium' });
  });

  it('falls back to the packaged chromium on a machine with only Node', () => {
    expect(chooseChromium({}, only())).toEqual({ from: 'package' });
  });
});
