/**
 * The region search of the home page and the region index pages (components/RegionSearch.astro):
 * the map's region loader (components/map/explorer/region-loader.ts) finds the region by name
 * or id from the few pieces it needs, as the map's search does; a region found opens its report,
 * otherwise the loader's message is shown (several matches, none). Coordinates are for the map.
 */
import { sitePath } from '../lib/nav.ts';
import { RegionLoader } from '../components/map/explorer/region-loader.ts';
import type { RegionIndex } from '../components/map/explorer/region-index.ts';

async function fetchJson(url: string): Promise<unknown> {
  const res = await fetch(url);
  if (!res.ok) throw new Error(`${url}: HTTP ${res.status}`);
  return res.json();
}

for (const form of document.querySelectorAll<HTMLFormElement>('form[data-region-search]')) {
  const base = form.dataset.base ?? '/';
  const result = form.querySelector<HTMLElement>('[data-search-result]');
  const input = form.querySelector<HTMLInputElement>('input[name="q"]');
  let loader: Promise<RegionLoader> | undefined;
  form.hidden = false;
  form.addEventListener('submit', async (ev) => {
    ev.preventDefault();
    if (!result || !input) return;
    form.dataset.result = 'loading';
    try {
      loader ??= fetchJson(form.dataset.indexUrl ?? '').then((index) => new RegionLoader(index as RegionIndex, (path) => fetchJson(sitePath(base, path))));
      const r = await (await loader).search(input.value);
      form.dataset.result = r.kind;
      if (r.kind === 'region') {
        result.textContent = `${r.name}: opening its report.`;
        location.href = sitePath(base, `regions/${r.id}/`);
      } else if (r.kind === 'point') result.textContent = 'For a place by latitude and longitude, use the search of the map page.';
      else result.textContent = r.message;
    } catch (err) {
      form.dataset.result = 'error';
      result.textContent = `The search could not run: ${(err as Error).message}`;
    }
  });
}
