import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { evaluationFractionInto, parseWorkSettings, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/work-settings.ts';
import { allowableWorkFraction } from '../../pipeline/work/work-fraction.ts';
import { DEFAULT_WORKLOAD_CLASSES } from '../../pipeline/work/workload-classes.ts';
import { expectWorkError } from './helpers.ts';

describe('work settings (the work: section of atlas.yaml)', () => {
  it('an atlas without work: gets the defaults: four classes, curve-2017, both acclimatization states, sun and shade, work clothes, 07–17 Mon–Sat', () => {
    const s = parseWorkSettings(undefined);
    expect(s).toEqual(workSettingsSchema.parse({}));
    expect(s).toMatchObject({
      classesFile: 'workload-classes.yaml',
      classes: ['low', 'moderate', 'high', 'very-high'],
      limitModel: 'curve-2017',
      airMovement: false,
      acclimatization: ['acclimatized', 'unacclimatized'],
      exposures: ['sun', 'shade'],
      restLocation: 'same-place',
      clothing: { ensemble: 'work-clothes' },
      shift: { start: 7, end: 17, days: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat'] },
    });
    const r = resolveWorkSettings(s, DEFAULT_WORKLOAD_CLASSES);
    expect(r.evaluations).toHaveLength(16);
    expect(r.evaluations[0].key).toBe('low.acclimatized.sun');
    expect(r.clothingAdjustment).toBe(0);
    expect(r.evaluations.every((e) => e.restWbgt === null)).toBe(true);
  });

  it('a YAML work section with rest in the shade, a table model and coveralls with hood resolves', () => {
    const raw = parse(`
classes: [high]
limitModel: table-1989
airMovement: true
acclimatization: [unacclimatized]
restLocation: shade
clothing: { ensemble: polyolefin-coveralls, hood: true }
shift: { start: 6, end: 14, days: [sun, mon, tue, wed, thu] }
`);
    const r = resolveWorkSettings(parseWorkSettings(raw), DEFAULT_WORKLOAD_CLASSES);
    expect(r.clothingAdjustment).toBe(2);
    expect(r.evaluations.map((e) => [e.key, e.restWbgt])).toEqual([
      ['high.unacclimatized.sun', 'shade'],
      ['high.unacclimatized.shade', null],
    ]);
    expect(r.evaluations[0].kernel.limitWork).toBe(23); // ISO 7243:1989 class 3, unacclimatized, air movement (docs/methods.md §8.3)
    expect(r.evaluations[0].kernel.threshold).toBe(21);
  });

  it('an unknown key is a WorkSettingsInvalid error naming it under work.', () => {
    expectWorkError(() => parseWorkSettings({ clases: ['low'] }, 'atlas.yaml'), 'WorkSettingsInvalid', /work: unknown key\(s\) "clases"/);
    expectWorkError(() => parseWorkSettings({ limitModel: 'wbgt-2030' }), 'WorkSettingsInvalid', /work\.limitModel/);
    expectWorkError(() => parseWorkSettings({ exposures: ['sun', 'sun'] }), 'WorkSettingsInvalid', /list an entry only once/);
    expectWorkError(() => parseWorkSettings({ clothing: { ensemble: 'work-clothes', cav: 2 } }), 'WorkSettingsInvalid', /either ensemble/);
  });

  it('a class not in the classes file is a WorkloadClassUnknown error', () => {
    expectWorkError(
      () => resolveWorkSettings(parseWorkSettings({ classes: ['low', 'digging'] }), DEFAULT_WORKLOAD_CLASSES),
      'WorkloadClassUnknown',
      /"digging"/,
    );
  });

  it('a bad shift, weekday or clothing is a catalogued error at the work key', () => {
    const bad = (raw: unknown) => () => resolveWorkSettings(parseWorkSettings(raw), DEFAULT_WORKLOAD_CLASSES, { file: 'atlas.yaml' });
    expect(expectWorkError(bad({ shift: { start: 7, end: 27 } }), 'WorkShiftInvalid').where).toEqual({ file: 'atlas.yaml', key: 'work.shift' });
    expectWorkError(bad({ shift: { days: ['mon', 'Mo'] } }), 'WorkWeekdayUnknown', /"Mo"/);
    expectWorkError(bad({ clothing: { ensemble: 'chainmail' } }), 'ClothingEnsembleUnknown');
    expectWorkError(bad({ clothing: { cav: 30 } }), 'ClothingAdjustmentOutOfRange');
  });

  it('evaluationFractionInto uses the sun or shade WBGT by exposure and rests in the shade when asked', () => {
    const r = resolveWorkSettings(parseWorkSettings({ classes: ['high'], acclimatization: ['acclimatized'], restLocation: 'shade' }), DEFAULT_WORKLOAD_CLASSES);
    const sun = Float32Array.from([29.5, 31]);
    const shade = Float32Array.from([26, 27]);
    const [inSun, inShade] = r.evaluations;
    const a = evaluationFractionInto(new Float32Array(2), sun, shade, inSun);
    const b = evaluationFractionInto(new Float32Array(2), sun, shade, inShade);
    expect(a[0]).toBeCloseTo(0.623, 3); // docs/methods.md §8.6: 415 W at 29.5 °C resting at 26 °C
    expect(a[1]).toBeCloseTo(allowableWorkFraction(31, 27, inSun.kernel), 6);
    expect(b[0]).toBeCloseTo(allowableWorkFraction(26, null, inShade.kernel), 6);
  });
});
