/**
 * The usual cautions of occupational heat guidance (docs/methods.md §14 lists them with their sources:
 * ISO 7243:2017 scope, NIOSH 2016 criteria, ACGIH/ISO clothing adjustment, ECMWF on grid-box
 * values, regulatory practice), written in our own words for the site.
 */

export interface Caution {
  id: string;
  title: string;
  /** The full caution, for the home page, reports and methods page. */
  text: string;
  /** One sentence for the footer. */
  short: string;
}

export const CAUTIONS: Caution[] = [
  {
    id: 'screening',
    title: 'Screening values only',
    text:
      'The limits behind these figures are screening values for fit, healthy, well-hydrated workers over a working day. ' +
      'Going over a limit calls for a closer assessment of the job; staying under it does not make the work safe for everyone.',
    short: 'Screening values for fit, hydrated workers, not a guarantee of safety.',
  },
  {
    id: 'acclimatization',
    title: 'Acclimatization matters',
    text:
      'Workers who are new, who return after a week or more away, or who are not yet used to the heat tolerate less: ' +
      'they need the lower limits and a gradual build-up of exposure over one to two weeks.',
    short: 'Workers not acclimatized to heat need lower limits.',
  },
  {
    id: 'grid-box',
    title: 'A grid-box value is not a site measurement',
    text:
      'The values are modelled averages over a reanalysis grid box many kilometres across. Sun and shade, hot surfaces, ' +
      'shelter from the wind, urban heat and nearby heat sources at a work site are not resolved: measure WBGT on site before operational decisions.',
    short: 'Modelled grid-box values are not a measurement at your site.',
  },
  {
    id: 'clothing',
    title: 'Clothing and protective equipment change the limit',
    text:
      'Heavier clothing and protective equipment lower the heat a worker can shed; coveralls and vapour-tight suits need an adjustment ' +
      'to the WBGT, or physiological monitoring instead of a limit.',
    short: 'Clothing and PPE change the limit.',
  },
  {
    id: 'who-decides',
    title: 'Local rules and a competent person decide',
    text:
      'Local regulations and national standards take precedence over the values used here. Work/rest schedules and stop-work decisions ' +
      'belong to the employer, advised by a competent person such as an occupational hygienist or physician.',
    short: 'Local regulations and a competent person decide work/rest and stop-work.',
  },
  {
    id: 'heat-illness',
    title: 'Signs of heat illness mean stop',
    text:
      'Anyone who shows signs of heat illness (dizziness, confusion, nausea, cramps, collapse, hot dry skin) must stop work at once ' +
      'and get medical help, whatever the figures say.',
    short: 'Any sign of heat illness: stop work and get medical help.',
  },
];
