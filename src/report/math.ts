// Formulas typeset at build time as MathML (KaTeX), so pages need no script and no web fonts.
import katex from 'katex';

const cache = new Map<string, string>();

export function texToMathml(tex: string, display = false): string {
  const key = `${display ? 'd' : 'i'}${tex}`;
  let html = cache.get(key);
  if (html === undefined) {
    html = katex.renderToString(tex, { output: 'mathml', displayMode: display, throwOnError: false, strict: 'ignore' });
    cache.set(key, html);
  }
  return html;
}
