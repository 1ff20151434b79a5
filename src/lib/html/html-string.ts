/**
 * HTML written as strings, byte for byte as Astro writes the same template (astro 5,
 * astro/dist/runtime/server/render/util.js `addAttribute`, escape.js `escapeHTML`): for the few
 * report parts with hundreds of cells per page (tables of months × hours, bars, heat-map
 * squares), whose per-element rendering in Astro was most of a region page's build time. The
 * components hand the string to Astro with `set:html`; test/site/html-string.test.ts holds each
 * against its Astro template.
 */

const TEXT_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', "'": '&#39;', '"': '&quot;' };

/** Text content as an Astro expression `{text}` writes it (html-escaper `escape`). */
export function htmlText(text: string): string {
  return text.replace(/[&<>'"]/g, (c) => TEXT_ESCAPES[c]);
}

/**
 * One attribute as an Astro expression attribute `key={value}` writes it: nothing for undefined,
 * ` key` for the empty string, else ` key="value"` with & and " escaped (`&#38;`, `&#34;`).
 * For attributes that are not HTML boolean attributes and values that are not http(s) URLs
 * (which Astro writes unescaped).
 */
export function htmlAttr(key: string, value: string | number | undefined): string {
  if (value === undefined) return '';
  const s = String(value);
  if (s === '') return ` ${key}`;
  return ` ${key}="${s.replace(/&/g, '&#38;').replace(/"/g, '&#34;')}"`;
}
