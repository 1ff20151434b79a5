/**
 * The categorical style of the human-climate-niche class of a cell's mean annual temperature.
 * Classes, codes and labels come from the climate stage (pipeline/climate/niche.ts, docs/methods.md §11:
 * code = index in NICHE_CLASSES; NICHE_NO_CLASS for an unknown MAT, drawn transparent).
 * Colours: four of the eight of the Okabe & Ito (2008) "Color Universal Design" set, made for
 * colour-vision deficiencies (hex values from memory; their separation under simulated
 * deficiencies is checked in test/publish/layers). Which class gets which colour is our own
 * choice: green and blue inside the niche, yellow at its margin, vermillion outside.
 */
import { NICHE_CLASSES, NICHE_LABELS, NICHE_NO_CLASS, type NicheClass } from '../../climate/niche.ts';
import type { CategoricalStyle } from './style.ts';

export const NICHE_COLOURS: Readonly<Record<NicheClass, string>> = Object.freeze({
  core: '#009e73', // bluish green
  second: '#56b4e9', // sky blue
  margin: '#f0e442', // yellow
  outside: '#d55e00', // vermillion
});

/** Style for a niche-class layer (units `1`: class codes of pipeline/climate/niche.ts). */
export function nicheClassStyle(title = 'Mean annual temperature and the human climate niche'): CategoricalStyle {
  return {
    kind: 'categorical',
    units: '1',
    title,
    paletteName: 'okabe-ito-niche',
    noDataCodes: [NICHE_NO_CLASS],
    noDataMeaning: 'no data: sea, masked out, or mean annual temperature unknown',
    classes: NICHE_CLASSES.map((c, code) => ({ value: code, label: NICHE_LABELS[c], color: NICHE_COLOURS[c] })),
  };
}
