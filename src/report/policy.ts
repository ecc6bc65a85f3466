// What a report page may load: only files of the report itself. Sent as a header by `serve` and
// written into every page as a meta tag, so the rule holds however the report is opened (from
// disk, from serve, from any static host). Images in handbook markdown that point elsewhere are
// also rewritten at build time (markdown.ts); this policy is the second line of defence.
// (frame-ancestors is not honoured in a meta tag, so it is left out here.)
export const CONTENT_SECURITY_POLICY = [
  "default-src 'none'",
  "img-src 'self' data:",
  // Inline SVG charts and figures carry style attributes.
  "style-src 'self' 'unsafe-inline'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');
