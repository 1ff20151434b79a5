/**
 * Every place that names an exposure names its model: the shade as the open sky with the sun
 * removed, the shelter as a roof or canopy at the air temperature after Lemke & Kjellstrom (2012)
 * (docs/methods.md §6.1; the bibliography entry `lemke2012` of pipeline/model/sources.ts).
 */
import { describe, expect, it } from 'vitest';
import { EXPOSURES } from '../../pipeline/work/work-settings.ts';
import { EXPOSURE_WORDS as DICTIONARY_WORDS } from '../../pipeline/publish/data-dictionary.ts';
import { EXPOSURE_WORDS as REPORT_WORDS } from '../../src/lib/report/selection.ts';
import { EXPOSURE_LABELS as MAP_LABELS } from '../../src/lib/explorer-catalogue.ts';
import { exposureLine } from '../../pipeline/publish/region-spreadsheets.ts';
import { sourceById } from '../../pipeline/model/sources.ts';

const MODEL: Record<string, RegExp> = {
  sun: /sun/i,
  shade: /(open sky|without direct or diffuse sun)/i,
  shelter: /roof or canopy.*air temperature.*Lemke & Kjellstrom 2012/i,
};

describe('exposure words', () => {
  it('the data dictionary, the region report and the map name every exposure with its model', () => {
    for (const x of EXPOSURES) {
      for (const [where, words] of [
        ['data dictionary', DICTIONARY_WORDS],
        ['region report', REPORT_WORDS],
        ['map', MAP_LABELS],
      ] as const) {
        expect(words[x], `${where}: ${x}`).toMatch(MODEL[x]);
      }
    }
  });

  it("the shelter's source is in the bibliography under the cited name", () => {
    expect(sourceById('lemke2012').cite).toBe('Lemke & Kjellstrom 2012');
  });

  it('the workbook line of a sun-and-shade build is as before; with the shelter it names every model', () => {
    expect(exposureLine(['sun', 'shade'])).toBe('sun, shade');
    const line = exposureLine(['sun', 'shade', 'shelter']);
    expect(line).toContain('shade (open sky with the sun removed)');
    expect(line).toMatch(MODEL.shelter);
  });
});
