// Handbook markdown: which images the report keeps (worked out from the rule in markdown.ts: inside
// the report, never climbing with ..) and that a kept image keeps its alternative text.
import { describe, expect, it } from 'vitest';
import { isInsideReport, renderMarkdown } from '../../src/report/markdown.ts';

describe('images in handbook markdown', () => {
  it.each([
    ['figure.png', true],
    ['./img/figure.png', true],
    ['data:image/png;base64,iVBORw0KGgo=', true],
    ['../figure.png', false],
    ['img/../../figure.png', false],
    ['%2e%2e/figure.png', false],
    ['/etc/figure.png', false],
    ['//images.example.invalid/figure.png', false],
    ['https://images.example.invalid/figure.png', false],
    ['file:///etc/passwd', false],
    ['img\\..\\figure.png', false],
    ['data:image/svg+xml;base64,PHN2Zy8+', false],
  ])('%s stays inside the report: %s', (src, inside) => {
    expect(isInsideReport(src)).toBe(inside);
  });

  it('keeps the alternative text of a kept image and names a blocked one', () => {
    const html = renderMarkdown('![cross-section of the cup](cup.png) ![pixel](https://images.example.invalid/p.png)');
    expect(html).toContain('<img src="cup.png" alt="cross-section of the cup">');
    expect(html).toContain('“pixel” is not shown');
    expect(html).not.toContain('<img src="https:');
  });
});
