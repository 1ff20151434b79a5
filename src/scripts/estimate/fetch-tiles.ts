/**
 * The page's loader of atlas files: fetches a path of the site's own data/ folder (the only origin
 * the Content-Security-Policy allows), once per page; the schedule stage's place.ts decodes them
 * (a cell's chunk serves every cell in it, and the nearest-land search reads chunk headers).
 */
import { EstimateDataUnavailable } from '../../../pipeline/schedule/errors.ts';
import type { AtlasLoader } from '../../../pipeline/schedule/place.ts';
import { sitePath } from '../../lib/nav.ts';

const files = new Map<string, Promise<Uint8Array>>();

/** A loader for the site served under `base`. Catalogued error: EstimateDataUnavailable. */
export function siteLoader(base: string): AtlasLoader {
  return (path) => {
    let p = files.get(path);
    if (!p) {
      p = (async () => {
        let res: Response;
        try {
          res = await fetch(sitePath(base, path));
        } catch (e) {
          throw EstimateDataUnavailable({ path, detail: `the request failed (${(e as Error).message})` }, { file: path });
        }
        if (!res.ok) throw EstimateDataUnavailable({ path, detail: `the server answered ${res.status} ${res.statusText}` }, { file: path });
        return new Uint8Array(await res.arrayBuffer());
      })();
      files.set(path, p);
      p.catch(() => files.delete(path));
    }
    return p;
  };
}
