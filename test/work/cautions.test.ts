import { describe, expect, it } from 'vitest';
import { CAUTIONS, CAUTION_SUMMARY, caution } from '../../pipeline/work/cautions.ts';

describe('cautions', () => {
  it('the cautions cover every item of docs/methods.md §14 once', () => {
    expect(CAUTIONS.map((c) => c.id)).toEqual([
      'screening-only',
      'most-not-all',
      'acclimatization',
      'individual-risk',
      'water-and-rest',
      'clothing',
      'metabolic-rate',
      'modelled-not-measured',
      'local-rules-decide',
      'stop-on-symptoms',
    ]);
    for (const c of CAUTIONS) expect(c.basis.length).toBeGreaterThan(5);
  });

  it('the wording defers to local regulations and a competent person, and says to stop on symptoms (docs/methods.md §14)', () => {
    expect(caution('local-rules-decide').text).toMatch(/Local law and national standards come first/);
    expect(caution('local-rules-decide').text).toMatch(/competent person/);
    expect(CAUTION_SUMMARY).toMatch(/Local regulations and a competent person/);
    expect(CAUTION_SUMMARY).toMatch(/not a site measurement/);
    expect(caution('stop-on-symptoms').text).toMatch(/stop work at once and get medical help/);
  });

  it('an unknown caution id is a programming error', () => {
    expect(() => caution('nope')).toThrow(/no caution/);
  });
});
