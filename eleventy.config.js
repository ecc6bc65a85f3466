// Eleventy configuration of the plumbline report. The report data arrives as the global `report`
// (added by src/report/site.ts); templates only lay it out.

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
  eleventyConfig.addFilter('rel', function (url) {
    return relativeHref(this.page?.url ?? '/', url);
  });
  return {
    dir: { includes: '_includes', layouts: '_layouts' },
    templateFormats: ['njk'],
    htmlTemplateEngine: 'njk',
  };
}
