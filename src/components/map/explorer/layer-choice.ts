/**
 * Which layer a view shows, and which options each control offers: only what was published.
 * The choices are settled in a fixed order (workload class, acclimatization, exposure, loss
 * function, statistic, month); at each step the options are those of the layers still in play,
 * and a wish no layer fulfils gives way to the first option. Choices a figure does not have
 * (a workload class for mean WBGT) are kept untouched for when the reader comes back. Pure.
 */
import type { ExplorerCatalogue, ExplorerLayer, LayerView } from './catalogue.ts';
import type { ViewState } from './view-state.ts';

/** The controls in settling order, with how each reads a layer. */
export const CHOICE_KEYS = ['workloadClass', 'acclimatization', 'exposure', 'loss', 'statistic', 'period'] as const;
export type ChoiceKey = (typeof CHOICE_KEYS)[number];

function choiceValue(layer: ExplorerLayer, key: ChoiceKey): string | undefined {
  if (key === 'statistic') return layer.statistic;
  if (key === 'period') return layer.period;
  return layer.view[key as keyof LayerView];
}

export interface ResolvedView {
  /** The layer shown; undefined when nothing is published. */
  layer: ExplorerLayer | undefined;
  /** The view, settled on that layer. */
  state: ViewState;
  /** Option ids each control offers now (empty: the control does not apply). */
  options: Record<ChoiceKey, string[]>;
}

export function resolveView(catalogue: ExplorerCatalogue, wish: ViewState): ResolvedView {
  const state: ViewState = { ...wish };
  const options = Object.fromEntries(CHOICE_KEYS.map((k) => [k, [] as string[]])) as Record<ChoiceKey, string[]>;
  if (!catalogue.figures.some((f) => f.id === state.figure)) state.figure = catalogue.figures[0]?.id ?? '';
  let candidates = catalogue.layers.filter((l) => l.figure === state.figure);
  for (const key of CHOICE_KEYS) {
    const present = new Set(candidates.map((l) => choiceValue(l, key)).filter((v): v is string => v !== undefined));
    if (present.size === 0) continue;
    const order = catalogue.choices[key].map((c) => c.id);
    options[key] = [...order.filter((id) => present.has(id)), ...[...present].filter((id) => !order.includes(id))];
    const wanted = state[key];
    const chosen = wanted !== undefined && present.has(wanted) ? wanted : options[key][0];
    state[key] = chosen;
    candidates = candidates.filter((l) => choiceValue(l, key) === chosen);
  }
  return { layer: candidates[0], state, options };
}

/** The layer of the same view in another period (for the month player), if published. */
export function layerForPeriod(catalogue: ExplorerCatalogue, state: ViewState, period: string): ExplorerLayer | undefined {
  const r = resolveView(catalogue, { ...state, period });
  return r.state.period === period ? r.layer : undefined;
}
