/**
 * The cautions that go with every work figure, in one wording for the site, the CSV tables and the
 * browser calculator (docs/methods.md §14 lists them with their sources). Plain text, no markup.
 */

export interface Caution {
  /** Stable id, for anchors and tests. */
  id: string;
  /** The caution, in plain words. */
  text: string;
  /** The kind of source behind it (docs/methods.md §14). */
  basis: string;
}

export const CAUTIONS: readonly Caution[] = [
  {
    id: 'screening-only',
    text: 'These are screening figures, not safety advice. A WBGT limit is meant for fit, healthy adults over a working day; an hour above it means a closer assessment is needed, not that work there is automatically unsafe, and an hour below it is not a guarantee of safety.',
    basis: 'International standard (ISO 7243:2017 scope)',
  },
  {
    id: 'most-not-all',
    text: 'The limits aim to keep the average body core temperature at or below 38 °C. They protect most healthy workers, not every worker.',
    basis: 'Standard note (ISO 7243:1989) and government criteria (NIOSH 2016)',
  },
  {
    id: 'acclimatization',
    text: 'Workers who are new, returning after a week or more away, or not yet used to the heat must be judged against the lower, unacclimatized limit. Getting used to heat takes one to two weeks of gradually longer exposure.',
    basis: 'Government criteria (NIOSH 2016)',
  },
  {
    id: 'individual-risk',
    text: 'Age, weight, fitness, earlier heat illness, heart disease, some medicines and alcohol all lower heat tolerance. Medical advice and health checks are part of working safely in heat.',
    basis: 'Government criteria and technical manuals',
  },
  {
    id: 'water-and-rest',
    text: 'Drink water regularly during work, little and often, and take breaks in a cooler place where possible; very large amounts of water in a short time are also harmful.',
    basis: 'Military and government guidance',
  },
  {
    id: 'clothing',
    text: 'Protective clothing changes the limit. The figures include only the clothing adjustment chosen; vapour-barrier suits may need monitoring of the workers themselves instead of a WBGT screen.',
    basis: 'ACGIH TLV and ISO 7243 annex',
  },
  {
    id: 'metabolic-rate',
    text: 'Work rates estimated from tables can be wrong by about a third, and the limit depends strongly on the work rate: check the workload class against the actual tasks.',
    basis: 'Government criteria (NIOSH 2016, quoting ISO)',
  },
  {
    id: 'modelled-not-measured',
    text: 'WBGT here is modelled from reanalysis data for a grid box tens of kilometres wide. It does not see the sun and shade, surfaces, shelter from wind, town heat or nearby heat sources of a particular site. Measure WBGT on site with a proper instrument before making operational decisions.',
    basis: 'Standards and reanalysis documentation (ECMWF: grid-box values, not point values)',
  },
  {
    id: 'local-rules-decide',
    text: 'Local law and national standards come first. Work/rest schedules and decisions to stop work are for the employer to make with a competent person, such as an occupational hygienist or occupational physician.',
    basis: 'Regulatory and professional practice',
  },
  {
    id: 'stop-on-symptoms',
    text: 'Whatever the figures say, anyone showing signs of heat illness (confusion, fainting, stopping sweating, vomiting, severe headache) must stop work at once and get medical help.',
    basis: 'All guidance',
  },
];

/** One paragraph for the head of a CSV file or the foot of a page. */
export const CAUTION_SUMMARY =
  'Screening figures only, for fit and hydrated adults: not safety advice. Modelled grid-box WBGT is not a site measurement. ' +
  'Acclimatization, health, clothing and the real work rate change the limit. Local regulations and a competent person ' +
  '(occupational hygienist or physician) decide work/rest and stop-work; anyone with signs of heat illness stops work and gets medical help.';

/** The caution with this id (throws a plain Error for an unknown id: a programming mistake, not a user error). */
export function caution(id: string): Caution {
  const c = CAUTIONS.find((x) => x.id === id);
  if (!c) throw new Error(`no caution "${id}"`);
  return c;
}
