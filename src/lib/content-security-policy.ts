/**
 * The site's Content-Security-Policy: only the site's own origin. Scripts and styles are files
 * (no inline script, no inline style; astro.config.mjs keeps Astro from inlining them).
 * Found by trying in Chromium (test/site/pages.test.ts reports any violation): MapLibre 6.20's
 * controls draw their icons as `data:` SVG images, so `img-src` allows `data:`; its worker is
 * loaded from the site's own `.mjs` file (setWorkerUrl), so workers need no `blob:`.
 * Pages carry it in a meta tag; `heathours preview` also sends it as a header, with the
 * directives a meta tag cannot carry.
 */

const DIRECTIVES: Array<[string, string]> = [
  ['default-src', "'self'"],
  ['script-src', "'self'"],
  ['style-src', "'self'"],
  ['img-src', "'self' data:"],
  ['font-src', "'self'"],
  ['connect-src', "'self'"],
  ['worker-src', "'self'"],
  ['object-src', "'none'"],
  ['base-uri', "'self'"],
  ['form-action', "'self'"],
];

/** The policy as a page's `<meta http-equiv="Content-Security-Policy">` carries it. */
export const CONTENT_SECURITY_POLICY = DIRECTIVES.map(([k, v]) => `${k} ${v}`).join('; ');

/** The policy as an HTTP header: the meta policy plus `frame-ancestors` (ignored in meta tags). */
export const CONTENT_SECURITY_POLICY_HEADER = `${CONTENT_SECURITY_POLICY}; frame-ancestors 'none'`;
