// Handbook markdown (summary, descriptions, rationales) to HTML for the report. Raw HTML is off,
// and the report loads nothing from outside itself: an image whose address leaves the report (a
// scheme such as https:, a protocol-relative //host, or an absolute path) is not rendered as an
// image but as a note that names it, so a reader sees what was left out and why. Relative images
// inside the report and data: images of the raster kinds are kept. (The pages' content security
// policy enforces the same in the browser.)
import MarkdownIt from 'markdown-it';

const md = new MarkdownIt({ html: false, linkify: true, typographer: true });

/**
 * An image address that stays inside the report: relative, without a scheme, not rooted, not
 * protocol-relative, and never climbing with `..` (from a page opened on disk, `../../x.png`
 * reaches files beside the report).
 */
export function isInsideReport(src: string): boolean {
  const s = src.trim();
  if (/^data:image\/(png|jpeg|gif|webp);/i.test(s)) return true;
  if (s.startsWith('/') || s.includes('\\')) return false;
  if (/^[a-z][a-z0-9+.-]*:/i.test(s)) return false;
  let path = s.split(/[?#]/, 1)[0] ?? '';
  try {
    path = decodeURIComponent(path);
  } catch {
    return false;
  }
  return !path.split('/').some((seg) => seg === '..');
}

const keptImage = md.renderer.rules.image!;

md.renderer.rules.image = (tokens, idx, _options, _env, self) => {
  const token = tokens[idx]!;
  const src = String(token.attrGet('src') ?? '');
  if (isInsideReport(src)) return keptImage(tokens, idx, _options, _env, self);
  const alt = self.renderInlineAsText(token.children ?? [], _options, _env);
  const label = alt ? `“${md.utils.escapeHtml(alt)}”` : 'an image';
  return `<span class="blocked-image">[${label} is not shown: the report loads nothing from outside itself; it was at <code>${md.utils.escapeHtml(src)}</code>]</span>`;
};

export function renderMarkdown(text: string): string {
  return md.render(text);
}
