// The folder source's containment test, on paths worked out by hand: a sibling whose name starts
// like the parent's is not inside it (the defect of a bare prefix check).
import { describe, expect, it } from 'vitest';
import { isInside } from '../../src/model/folder-source.ts';

describe('isInside', () => {
  it.each([
    ['/a/site', '/a/site', true],
    ['/a/site', '/a/site/x/y.html', true],
    ['/a/site', '/a/site-secret', false],
    ['/a/site', '/a/site-secret/secret.txt', false],
    ['/a/site', '/a', false],
    ['/a/site', '/b/site', false],
    ['/', '/etc/passwd', true],
  ])('%s holds %s: %s', (parent, child, inside) => {
    expect(isInside(parent, child)).toBe(inside);
  });
});
