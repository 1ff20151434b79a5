/**
 * A continuous style for a kind of published figure, with our ramp pairing (ramps.ts
 * RAMP_FOR_FIGURE) and a domain the caller passes (a shared one, so months compare) or picks
 * with niceDomain().
 */
import { RAMP_FOR_FIGURE, type FigureKind } from './ramps.ts';
import type { ContinuousStyle } from './style.ts';

export function figureStyle(
  kind: FigureKind,
  domain: [number, number],
  units: string,
  extra: { title?: string; classes?: number; noDataMeaning?: string } = {},
): ContinuousStyle {
  const { ramp, reverse } = RAMP_FOR_FIGURE[kind];
  return { kind: 'continuous', ramp, reverse, domain, units, ...extra };
}
