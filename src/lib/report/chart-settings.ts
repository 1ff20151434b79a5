/**
 * Fixed chart settings of the region reports: the WBGT colour domain (fixed, so the heat maps of
 * different regions can be compared; our choice: 10–35 °C covers every default limit, 21.6–33 °C)
 * and the colours of the acclimatization series (two well-separated points of d3-scale-chromatic's
 * viridis, colour-blind-safe).
 */
import { interpolateViridis } from 'd3-scale-chromatic';

/** [°C] */
export const WBGT_CHART_DOMAIN: [number, number] = [10, 35];

export const SERIES_COLOURS: readonly string[] = [interpolateViridis(0.3), interpolateViridis(0.78)];
