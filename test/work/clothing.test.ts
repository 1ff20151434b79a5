import { describe, expect, it } from 'vitest';
import { CLOTHING_ENSEMBLES, HOOD_CAV, clothingAdjustment, clothingEnsemble } from '../../pipeline/work/clothing.ts';
import { expectWorkError } from './helpers.ts';

describe('clothing adjustment values', () => {
  it('the ensemble table carries its values with their provenance tags, each with its published source', () => {
    // Verified: Bernard et al. 2008 (J Occup Environ Hyg 5(1):1–5, abstract: cotton work clothes are the
    // baseline, 0 for cotton coveralls, 1.0 Tyvek 1422A, 2.5 NexGen); the other ACGIH values from memory.
    const expected: Record<string, [number, string]> = {
      'work-clothes': [0, 'verified'],
      'woven-coveralls': [0, 'verified'],
      'double-layer-woven': [3, 'from-memory'],
      'sms-coveralls': [0.5, 'from-memory'],
      'polyolefin-coveralls': [1, 'verified'],
      'microporous-coveralls': [2.5, 'verified'],
      'vapour-barrier-coveralls': [11, 'from-memory'],
    };
    expect(Object.fromEntries(CLOTHING_ENSEMBLES.map((e) => [e.id, [e.cav, e.sourceTag]]))).toEqual(expected);
    for (const e of CLOTHING_ENSEMBLES) {
      expect(e.source).not.toMatch(/METHODS\.md/);
      expect(e.source).toMatch(e.sourceTag === 'verified' ? /Bernard et al\. 2008/ : /ACGIH TLV.*value from memory/);
    }
  });

  it('a hood adds 1 °C-WBGT to any ensemble (ACGIH, from memory; docs/methods.md §8.4)', () => {
    expect(HOOD_CAV).toBe(1);
    expect(clothingAdjustment({ ensemble: 'polyolefin-coveralls', hood: true })).toBe(2);
    expect(clothingAdjustment({ ensemble: 'work-clothes' })).toBe(0);
  });

  it('a value given directly is used as it is', () => {
    expect(clothingAdjustment({ cav: 4.5 })).toBe(4.5);
  });

  it('an unknown ensemble is a ClothingEnsembleUnknown error listing the known ones', () => {
    expectWorkError(() => clothingEnsemble('tyvek', { key: 'work.clothing' }), 'ClothingEnsembleUnknown', /known: work-clothes, woven-coveralls/);
  });

  it('a negative, absurd or non-finite value is a ClothingAdjustmentOutOfRange error', () => {
    for (const v of [-1, 25, Number.NaN]) expectWorkError(() => clothingAdjustment({ cav: v }), 'ClothingAdjustmentOutOfRange');
  });
});
