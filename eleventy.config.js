// Eleventy configuration of the plumbline report. The report data arrives as the global `report`
// (added by src/report/site.ts); templates only lay it out.

import { createRequire } from 'node:module';

/**
 * Compile each Nunjucks template once per source text rather than once per page. Eleventy 3.1
 * builds a fresh Nunjucks Template for every paginated page and leaves Nunjucks out of its own
 * compile cache; a report has a page per verdict, so this is most of the build time. The compiled
 * code depends only on the source text (filters are looked up when it runs), so sharing it is safe.
 */
function memoizeNunjucksCompilation() {
  const nunjucks = createRequire(import.meta.resolve('@11ty/eleventy'))('nunjucks');
  const proto = nunjucks.Template.prototype;
  if (proto.__plumblineMemo) return;
  const memo = new Map();
  const compileOnce = proto._compile;
  proto._compile = function () {
    const key = `${this.path}\u0000${this.tmplStr}`;
    const hit = memo.get(key);
    if (hit) {
      this.blocks = hit.blocks;
      this.rootRenderFunc = hit.rootRenderFunc;
      this.compiled = true;
      return;
    }
    compileOnce.call(this);
    memo.set(key, { blocks: this.blocks, rootRenderFunc: this.rootRenderFunc });
  };
  proto.__plumblineMemo = memo;
}

/** Relative link from the page being rendered to a site path, so the report also works from disk. */
export function relativeHref(from, to) {
  const depth = from.split('/').filter(Boolean).length;
  const [path, hash] = to.split('#');
  let target = path.replace(/^\//, '');
  if (target === '' || target.endsWith('/')) target += 'index.html';
  return `${'../'.repeat(depth)}${target}${hash ? `#${hash}` : ''}`;
}

export default function (eleventyConfig) {
  eleventyConfig.setQuietMode(true);
  // Installed in a team's project, the templates live under node_modules/plumbline/: Eleventy
  // ignores node_modules by default, and also what the .gitignore of the folder it runs in lists
  // (a team's lists node_modules/). Either left the report with no page at all.
  eleventyConfig.ignores.delete('**/node_modules/**');
  eleventyConfig.setUseGitIgnore(false);
  memoizeNunjucksCompilation();
  eleventyConfig.addFilter('rel', function (url) {
    return relativeHref(this.page?.url ?? '/', url);
  });
  return {
    dir: { includes: '_includes', layouts: '_layouts' },
    templateFormats: ['njk'],
    htmlTemplateEngine: 'njk',
  };
}
