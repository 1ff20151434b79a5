/**
 * What a figure's combination key means, split into table columns: an evaluation key
 * `class.acclimatization.exposure`, a loss view `method.exposure`, an exposure `sun`/`shade`/`shelter`, or
 * `air`.
 */
export interface ComboColumns {
  workload_class: string;
  acclimatization: string;
  exposure: string;
  method: string;
}

export function comboColumns(figureId: string, key: string): ComboColumns {
  const parts = key.split('.');
  // Workforce figures: a class (or `all`), mixing acclimatization and exposure as the shares say.
  if (figureId.startsWith('person-hours-') || figureId === 'full-time-equivalents-lost' || figureId === 'outdoor-work-time-lost') {
    return { workload_class: key, acclimatization: 'by-shares', exposure: 'by-shares', method: 'limit' };
  }
  if (figureId.startsWith('hours-')) return { workload_class: parts[0], acclimatization: parts[1], exposure: parts[2], method: 'limit' };
  if (figureId === 'capacity-loss-shift') return { workload_class: '', acclimatization: '', exposure: parts[1], method: parts[0] };
  if (key === 'air') return { workload_class: '', acclimatization: '', exposure: '', method: '' };
  return { workload_class: '', acclimatization: '', exposure: key, method: '' };
}
