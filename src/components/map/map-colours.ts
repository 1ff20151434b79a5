/**
 * The colours of the site's maps, our own choice: a pale sea, a sand-grey land, thin grey borders,
 * the dataset's grid in a burnt orange, region outlines in deep blue. Kept apart so the browser
 * tests can check drawn pixels against the same values.
 */

/** A colour as sRGB bytes [0–255]. */
export type Rgb = [number, number, number];

export const MAP_COLOURS = {
  sea: [214, 228, 236] as Rgb,
  land: [232, 226, 212] as Rgb,
  border: [168, 160, 146] as Rgb,
  gridFill: [207, 92, 28] as Rgb,
  gridLine: [150, 60, 15] as Rgb,
  region: [23, 63, 95] as Rgb,
};

/** Opacity of the grid extent's fill [0–1]. */
export const GRID_FILL_OPACITY = 0.3;

/** `rgb(r, g, b)` for a MapLibre paint property. */
export function cssRgb([r, g, b]: Rgb): string {
  return `rgb(${r}, ${g}, ${b})`;
}

/** `top` over `bottom` with opacity `alpha` [0–1], per channel in sRGB bytes (WebGL's blend). */
export function blendOver(top: Rgb, bottom: Rgb, alpha: number): Rgb {
  return [0, 1, 2].map((i) => Math.round(alpha * top[i] + (1 - alpha) * bottom[i])) as Rgb;
}
