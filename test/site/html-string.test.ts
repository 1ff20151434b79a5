/**
 * The report parts written as strings (src/lib/html/html-string.ts) escape text and write
 * attributes byte for byte as Astro does: checked against Astro's own `escapeHTML` and
 * `addAttribute` (astro/runtime/server, the package the site is built with) on awkward values.
 * The whole report written both ways was compared file by file on a 1,000-region site when the
 * string parts were made (bench/regions-1000.bench.ts); test/site/site-parts.test.ts and the
 * page tests check the markup the pages' scripts read.
 */
import { describe, expect, it } from 'vitest';
import { addAttribute, escapeHTML } from 'astro/runtime/server/index.js';
import { htmlAttr, htmlText } from '../../src/lib/html/html-string.ts';

const VALUES = [
  '',
  'plain',
  'a "quoted" value',
  "it's",
  '<b>&amp;</b>',
  'x & y',
  '–01:00',
  '30.8 °C',
  'M0,4H14',
  '#fb7a5a',
  '0',
  'NaN',
  '-Infinity',
  'high very-high',
];

describe('report parts written as strings', () => {
  it('escape text as Astro escapes an expression', () => {
    for (const v of VALUES) expect(htmlText(v), v).toBe(String(escapeHTML(v)));
  });
  it('write string and number attributes as Astro writes key={value} (empty: bare key; undefined: nothing)', () => {
    for (const key of ['class', 'data-value', 'd', 'fill', 'data-above-acclimatized']) {
      for (const v of VALUES) expect(htmlAttr(key, v), `${key}=${v}`).toBe(String(addAttribute(v, key)));
      for (const n of [0, 1.5, -2, 1e21]) expect(htmlAttr(key, n), `${key}=${n}`).toBe(String(addAttribute(n, key)));
      expect(htmlAttr(key, undefined)).toBe(String(addAttribute(undefined, key)));
    }
  });
});
