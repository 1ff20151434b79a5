/**
 * The categorical style of the human-climate-niche class of a cell's mean annual temperature
 * (METHODS.md §7: core 11–15 °C and secondary mode 20–25 °C after Xu et al. 2020; outside at
 * MAT ≥ 29 °C after Lenton et al. 2023; margin for the rest). Colours: four of the eight of the
 * Okabe & Ito (2008) "Color Universal Design" set, chosen for colour-vision deficiencies (hex
 * values from memory); which class gets which colour is our own choice: greens and blues inside
 * the niche, yellow at its margin, vermillion outside.
 */
import type { CategoricalStyle } from './style.ts';

/** Integer codes the climate stage writes per cell; override if it uses others. */
export interface NicheCodes {
  core: number;
  secondary: number;
  margin: number;
  outside: number;
}

export const DEFAULT_NICHE_CODES: NicheCodes = { core: 1, secondary: 2, margin: 3, outside: 4 };

export const NICHE_COLOURS = {
  core: '#009e73', // bluish green
  secondary: '#56b4e9', // sky blue
  margin: '#f0e442', // yellow
  outside: '#d55e00', // vermillion
} as const;

/** Style for a niche-class layer (units `1`: class codes). */
export function nicheClassStyle(codes: NicheCodes = DEFAULT_NICHE_CODES, title = 'Mean annual temperature and the human climate niche'): CategoricalStyle {
  return {
    kind: 'categorical',
    units: '1',
    title,
    paletteName: 'okabe-ito-niche',
    classes: [
      { value: codes.core, label: 'core of the niche (11–15 °C)', color: NICHE_COLOURS.core },
      { value: codes.secondary, label: 'second mode of the niche (20–25 °C)', color: NICHE_COLOURS.secondary },
      { value: codes.margin, label: 'margin of the niche (other, below 29 °C)', color: NICHE_COLOURS.margin },
      { value: codes.outside, label: 'outside the niche (29 °C or more)', color: NICHE_COLOURS.outside },
    ],
  };
}
