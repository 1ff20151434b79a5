import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { DEFAULT_WORKLOAD_CLASSES, parseWorkloadClasses, selectWorkloadClasses, type WorkloadClasses } from '../../pipeline/work/workload-classes.ts';
import { expectWorkError } from './helpers.ts';

const shipped = parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')) as unknown;
const clone = (): WorkloadClasses => structuredClone(DEFAULT_WORKLOAD_CLASSES);

describe('workload classes', () => {
  it('the shipped content/workload-classes.yaml validates and equals DEFAULT_WORKLOAD_CLASSES', () => {
    expect(parseWorkloadClasses(shipped)).toEqual(DEFAULT_WORKLOAD_CLASSES);
  });

  it('the default rates are the ISO 7243 class values 180/300/415/520 W with rest at 115 W (docs/methods.md §8.1)', () => {
    const c = parseWorkloadClasses(shipped);
    expect(c.rest.metabolicRate).toBe(115);
    expect(c.classes.map((x) => [x.id, x.metabolicRate])).toEqual([
      ['low', 180],
      ['moderate', 300],
      ['high', 415],
      ['very-high', 520],
    ]);
  });

  it('each default rate lies inside its ISO 7243:1989 class bounds in W for a 1.8 m² body (docs/methods.md §8.1)', () => {
    const bounds: Record<string, [number, number]> = { low: [117, 234], moderate: [234, 360], high: [360, 468], 'very-high': [468, 1000] };
    for (const c of DEFAULT_WORKLOAD_CLASSES.classes) {
      expect(c.metabolicRate).toBeGreaterThan(bounds[c.id][0]);
      expect(c.metabolicRate).toBeLessThanOrEqual(bounds[c.id][1]);
    }
    expect(DEFAULT_WORKLOAD_CLASSES.rest.metabolicRate).toBeLessThanOrEqual(117);
  });

  it('a user-defined class is accepted', () => {
    const c = clone();
    c.classes.push({ id: 'rebar-tying', name: 'Rebar tying', metabolicRate: 350, description: 'Bending and tying steel bars.' });
    expect(parseWorkloadClasses(c).classes).toHaveLength(5);
  });

  it('a duplicate id is a WorkloadClassDuplicate error naming the file and the entry', () => {
    const c = clone();
    c.classes.push({ ...c.classes[0] });
    const err = expectWorkError(() => parseWorkloadClasses(c, 'wc.yaml'), 'WorkloadClassDuplicate', /"low"/);
    expect(err.where).toEqual({ file: 'wc.yaml', key: 'classes.4' });
  });

  for (const [label, value] of [
    ['zero', 0],
    ['negative', -180],
    ['absurd (> 1000 W)', 1500],
    ['not finite', Number.POSITIVE_INFINITY],
  ] as const) {
    it(`a ${label} metabolic rate is a MetabolicRateOutOfRange error`, () => {
      const c = clone();
      c.classes[1].metabolicRate = value;
      const err = expectWorkError(() => parseWorkloadClasses(c), 'MetabolicRateOutOfRange', /"moderate"/);
      expect(err.where.key).toBe('classes.1.metabolicRate');
    });
  }

  it('a zero rest rate is a MetabolicRateOutOfRange error at rest.metabolicRate', () => {
    const c = clone();
    c.rest.metabolicRate = 0;
    expect(expectWorkError(() => parseWorkloadClasses(c), 'MetabolicRateOutOfRange').where.key).toBe('rest.metabolicRate');
  });

  it('a rest rate at or above a work rate is a RestRateNotBelowWork error', () => {
    const c = clone();
    c.rest.metabolicRate = 180;
    expectWorkError(() => parseWorkloadClasses(c), 'RestRateNotBelowWork', /rest metabolic rate 180 W is not below the rate of class "low"/);
  });

  it('an unknown key or a bad slug is a WorkloadClassesInvalid error naming the key', () => {
    const c = clone() as unknown as { classes: Record<string, unknown>[] };
    c.classes[0].metabolic_rate = 180;
    expectWorkError(() => parseWorkloadClasses(c), 'WorkloadClassesInvalid', /classes\.0: unknown key\(s\) "metabolic_rate"/);
    const d = clone();
    d.classes[0].id = 'Low Work';
    expectWorkError(() => parseWorkloadClasses(d), 'WorkloadClassesInvalid', /classes\.0\.id: use lower-case/);
  });

  it('a rate given as text is a WorkloadClassesInvalid error', () => {
    const c = clone() as unknown as { classes: Record<string, unknown>[] };
    c.classes[2].metabolicRate = '415 W';
    expectWorkError(() => parseWorkloadClasses(c), 'WorkloadClassesInvalid', /classes\.2\.metabolicRate/);
  });

  it('selecting an unknown class id is a WorkloadClassUnknown error listing the defined ids', () => {
    expect(selectWorkloadClasses(DEFAULT_WORKLOAD_CLASSES, ['high', 'low']).map((c) => c.id)).toEqual(['high', 'low']);
    const err = expectWorkError(
      () => selectWorkloadClasses(DEFAULT_WORKLOAD_CLASSES, ['low', 'heavy']),
      'WorkloadClassUnknown',
      /defined classes: low, moderate, high, very-high/,
    );
    expect(err.where.key).toBe('work.classes.1');
  });
});
