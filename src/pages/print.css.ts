/**
 * Build-time endpoint `/print.css`: the printed pages' footer with this build's atlas, build time
 * and data, and the page numbers (src/lib/print-footer.ts). Page.astro links it with
 * `media="print"`.
 */
import type { APIRoute } from 'astro';
import { loadInventory } from '../data/inventory.ts';
import { formatUtc } from '../lib/format.ts';
import { productDescription } from '../lib/product.ts';
import { printFooterCss } from '../lib/print-footer.ts';
import { hasManifest, loadManifest } from '../data/manifest.ts';

export const GET: APIRoute = () => {
  const { atlas, generated } = loadInventory();
  const version = hasManifest() ? ` ${loadManifest().codeVersion}` : '';
  const css = printFooterCss({
    atlasTitle: atlas.title,
    build: `built ${formatUtc(generated)} by heathours${version}`,
    data: atlas.invented ? 'invented, no real place' : productDescription(atlas.product).name,
  });
  return new Response(css, { headers: { 'Content-Type': 'text/css; charset=utf-8' } });
};
