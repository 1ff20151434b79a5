/**
 * The footer of every printed page: the atlas, the build and the data on the left, the page
 * number on the right, as CSS `@page` margin boxes (CSS Paged Media; Chromium prints them since
 * version 131). Margin boxes take only literal strings and counters, so the build's words are
 * written into a stylesheet of their own at build time (src/pages/print.css.ts), linked for print
 * only. Pure.
 */

/** A CSS string literal of `text`: quotes and backslashes escaped, line breaks as spaces. */
export function cssString(text: string): string {
  return `"${text
    .replace(/\\/g, '\\\\')
    .replace(/"/g, '\\"')
    .replace(/[\r\n\f]+/g, ' ')}"`;
}

export interface PrintFooterFacts {
  atlasTitle: string;
  /** "built 2026-01-01 00:00 UTC by heathours 0.1.0". */
  build: string;
  /** "invented data" or the dataset's name. */
  data: string;
}

/** The line on every printed page's foot, left. */
export function printFooterText(f: PrintFooterFacts): string {
  return `${f.atlasTitle} · ${f.build} · data: ${f.data}`;
}

/** The print stylesheet: page size, margins, the footer and the page numbers. */
export function printFooterCss(f: PrintFooterFacts): string {
  return `@charset "UTF-8";
/* Written at build time by src/pages/print.css.ts: the printed page's footer (CSS @page margin boxes). */
@page {
  size: A4;
  margin: 12mm 11mm 16mm;
  @bottom-left { content: ${cssString(printFooterText(f))}; width: 85%; font: 7pt system-ui, sans-serif; color: #000; vertical-align: top; padding-top: 3mm; }
  @bottom-right { content: "Page " counter(page) " of " counter(pages); width: 15%; font: 7pt system-ui, sans-serif; color: #000; vertical-align: top; padding-top: 3mm; white-space: nowrap; }
}
`;
}
