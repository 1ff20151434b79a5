// The Astro site's configuration. pipeline/publish/site.ts calls Astro's build() with this file
// plus the data folder (HEATHOURS_DATA_DIR), the output folder and the base path the site is served
// under (HEATHOURS_SITE_BASE, from the atlas config's `site.base`; `/` by default). Every link and
// fetch of the pages goes through that base (src/lib/nav.ts sitePath), none is root-absolute, so
// the site can live in a sub-folder of a host. Everything the pages load is a
// file of the site's own origin: no inline scripts or styles (they would break the
// Content-Security-Policy in src/lib/content-security-policy.ts), no remote fonts or assets.
import { defineConfig } from 'astro/config';

export default defineConfig({
  output: 'static',
  base: process.env.HEATHOURS_SITE_BASE || '/',
  trailingSlash: 'ignore',
  build: {
    format: 'directory',
    inlineStylesheets: 'never',
    assets: 'assets',
    // Pages rendered while the previous ones are written (the same files; 1,000 regions in two
    // parts: 94 s against 115 s of wall time at load 5–7, CPU 94 against 98 s).
    concurrency: 4,
  },
  devToolbar: { enabled: false },
  integrations: [
    {
      // The server bundle only renders the pages during the build and is never shipped: it is
      // bundled without tree-shaking, which took Rollup 4–5 s of each build (each part of a
      // site built in parts builds it again). The browser's bundles are tree-shaken as before.
      name: 'heathours-prerender-bundle',
      hooks: {
        'astro:build:setup': ({ vite, target }) => {
          if (target !== 'server') return;
          vite.build ??= {};
          vite.build.rollupOptions = { ...vite.build.rollupOptions, treeshake: false };
        },
      },
    },
  ],
  prefetch: false,
  // The methods document (docs/methods.md, src/pages/methods/document.astro) is Markdown; code
  // highlighting would write inline styles, which the Content-Security-Policy forbids.
  markdown: { syntaxHighlight: false },
  vite: {
    build: {
      // 0: never inline scripts, styles or images as data: URLs or inline tags.
      assetsInlineLimit: 0,
      // MapLibre's chunk is about 1 MB; it is loaded only on pages with a map.
      chunkSizeWarningLimit: 1500,
    },
  },
});
