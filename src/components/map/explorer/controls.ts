/**
 * The explorer's controls: one `<select>` per choice (layer, month, workload class,
 * acclimatization, exposure, loss function, statistic), each shown only when the current figure
 * has more than nothing to choose, and listing only the options that were published
 * (layer-choice.ts). DOM only.
 */
import type { ExplorerCatalogue } from './catalogue.ts';
import { CHOICE_KEYS, type ChoiceKey } from './layer-choice.ts';
import type { ViewState } from './view-state.ts';

export interface ControlElements {
  figure: HTMLSelectElement;
  selects: Record<ChoiceKey, HTMLSelectElement>;
}

/** Finds the controls by their `data-choice` attributes inside `form`. */
export function findControls(form: HTMLElement): ControlElements {
  const pick = (name: string) => {
    const s = form.querySelector<HTMLSelectElement>(`select[data-choice="${name}"]`);
    if (!s) throw new Error(`map controls: no select for ${name}`);
    return s;
  };
  return { figure: pick('figure'), selects: Object.fromEntries(CHOICE_KEYS.map((k) => [k, pick(k)])) as Record<ChoiceKey, HTMLSelectElement> };
}

function fill(select: HTMLSelectElement, options: Array<{ id: string; label: string }>, value: string | undefined): void {
  const same = select.options.length === options.length && options.every((o, i) => select.options[i].value === o.id);
  if (!same) select.replaceChildren(...options.map((o) => new Option(o.label, o.id)));
  if (value !== undefined) select.value = value;
}

/** Shows each control with the options of the settled view and selects its values. */
export function syncControls(c: ControlElements, catalogue: ExplorerCatalogue, options: Record<ChoiceKey, string[]>, state: ViewState): void {
  fill(
    c.figure,
    catalogue.figures.map((f) => ({ id: f.id, label: f.label })),
    state.figure,
  );
  for (const key of CHOICE_KEYS) {
    const ids = options[key];
    const labels = catalogue.choices[key];
    fill(
      c.selects[key],
      ids.map((id) => ({ id, label: labels.find((x) => x.id === id)?.label ?? id })),
      state[key],
    );
    const wrap = c.selects[key].closest<HTMLElement>('[data-control]');
    // A control with one option left still says what is shown (e.g. the only statistic), but cannot change it.
    if (wrap) wrap.hidden = ids.length === 0;
    c.selects[key].disabled = ids.length <= 1;
  }
}
