/** Reading CF attributes tolerantly: any case of the name, scalars or 1-element lists, text trimmed. */
import type { AttrValue, SourceVariable } from './source.ts';

/** The attribute `name` of `v`, matched exactly first and then ignoring case. */
export function attr(v: Pick<SourceVariable, 'attrs'>, name: string): AttrValue | undefined {
  if (name in v.attrs) return v.attrs[name];
  const lower = name.toLowerCase();
  for (const [k, val] of Object.entries(v.attrs)) if (k.toLowerCase() === lower) return val;
  return undefined;
}

/** A text attribute, trimmed; lists of strings are joined with a space. */
export function attrText(v: Pick<SourceVariable, 'attrs'>, name: string): string | undefined {
  const a = attr(v, name);
  if (typeof a === 'string') return a.trim();
  if (Array.isArray(a) && a.every((x) => typeof x === 'string')) return (a as string[]).join(' ').trim();
  return undefined;
}

/** A numeric attribute's first value (text holding a number is accepted too). */
export function attrNumber(v: Pick<SourceVariable, 'attrs'>, name: string): number | undefined {
  const a = attr(v, name);
  if (typeof a === 'number') return a;
  if (Array.isArray(a) && typeof a[0] === 'number') return a[0] as number;
  if (typeof a === 'string' && a.trim() !== '' && Number.isFinite(Number(a))) return Number(a);
  return undefined;
}

/** All values of a numeric attribute. */
export function attrNumbers(v: Pick<SourceVariable, 'attrs'>, name: string): number[] {
  const a = attr(v, name);
  if (typeof a === 'number') return [a];
  if (Array.isArray(a)) return (a as unknown[]).filter((x): x is number => typeof x === 'number');
  return [];
}
