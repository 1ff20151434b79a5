/** The atlas's work settings (manifest `work`) in plain words for the report pages. Pure. */
import type { AtlasManifest } from '../../data/atlas-manifest.ts';
import { clockHour } from './months.ts';

const LIMIT_MODEL_WORDS: Record<string, string> = {
  'curve-2017': 'continuous limit curves in the work rate (NIOSH 2016 REL and RAL; the same form as ISO 7243:2017)',
  'table-1989': 'ISO 7243:1989 reference values, linear in the work rate between the class rates',
};

const DAY_WORDS: Record<string, string> = { mon: 'Mon', tue: 'Tue', wed: 'Wed', thu: 'Thu', fri: 'Fri', sat: 'Sat', sun: 'Sun' };

/** "07:00–17:00, Mon Tue Wed Thu Fri Sat". */
export function shiftWords(w: AtlasManifest['work']): string {
  return `${clockHour(w.shift.start)}–${clockHour(w.shift.end)}, ${w.shift.days.map((d) => DAY_WORDS[d] ?? d).join(' ')}`;
}

export function limitModelWords(w: AtlasManifest['work']): string {
  const base = LIMIT_MODEL_WORDS[w.limitModel] ?? w.limitModel;
  return w.limitModel === 'table-1989' ? `${base}${w.airMovement ? ', with air movement' : ', still air'}` : base;
}

export function clothingWords(w: AtlasManifest['work']): string {
  const c = w.clothing;
  if (c.cav !== undefined) return 'a clothing adjustment value given directly';
  return `${(c.ensemble ?? 'work-clothes').replace(/-/g, ' ')}${c.hood ? ' with a hood' : ''}`;
}

export function restWords(w: AtlasManifest['work']): string {
  return w.restLocation === 'shade' ? 'in the shade' : 'where the work is';
}
