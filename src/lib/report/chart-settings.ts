/**
 * Fixed chart settings of the region reports: the WBGT colour domain (fixed, so the heat maps of
 * different regions can be compared; our choice: 10–35 °C covers every default limit, 21.6–33 °C)
 * and the colours of the acclimatization series: two points of the site's hours ramp
 * (pipeline/publish/layers/ramps.ts COLOUR_KINDS.hours), the darker for the workers who lose more
 * (not acclimatized), well apart in lightness so they read in grey and with colour-vision
 * deficiencies.
 */
import { COLOUR_KINDS } from '../../../pipeline/publish/layers/ramps.ts';
import { kindInterpolator } from '../charts/ramp.ts';

/** [°C] */
export const WBGT_CHART_DOMAIN: [number, number] = [10, 35];

const hours = kindInterpolator(COLOUR_KINDS.hours);
export const SERIES_COLOURS: readonly string[] = [hours(0.45), hours(0.85)];
