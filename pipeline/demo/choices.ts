/**
 * The demo dataset's choices that the command line offers before any demo code is loaded: its
 * layouts and its default seed (re-exported by ./index.ts).
 */

export type DemoLayout = 'legacy' | 'netcdf4' | 'mixed';
export const DEMO_LAYOUTS: readonly DemoLayout[] = ['legacy', 'netcdf4', 'mixed'];
/** Seed used when none is given [–]. */
export const DEFAULT_SEED = 7;

/** A grid by name, or by size: `NLATxNLON@RESOLUTION`, e.g. `300x300@0.1`. */
export type DemoGridChoice = { nLat: number; nLon: number; resolution: number } | 'small' | 'default' | 'country';
