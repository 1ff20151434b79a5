/**
 * The work stage's formulas and rules as the methods page shows them: equation, symbols,
 * constants and sources (pipeline/model/sources.ts). Exported constants are imported, never
 * copied; numbers written inside a function are listed with that function as `code`, and
 * test/work/methods.test.ts evaluates each such method with the listed values against the
 * function. Pure (no node: imports), like the rest of this folder.
 */
import { eq, type MethodConstant, type MethodGroup } from '../model/sources.ts';
import { LIMIT_CURVE_2017, TABLE_1989_LIMITS, TABLE_1989_RATES } from './limit-curves.ts';
import { CLOTHING_ENSEMBLES, HOOD_CAV, HOOD_CAV_SOURCE_TAG, MAX_CAV } from './clothing.ts';
import { KJELLSTROM_2018 } from './capacity-loss.ts';
import { MAX_METABOLIC_RATE_W } from './workload-classes.ts';
import { WBGT_BIN_COUNT, WBGT_BIN_LOWER, WBGT_BIN_WIDTH } from './wbgt-bins.ts';

const LC = 'pipeline/work/limit-curves.ts';
const DUNNE = 'pipeline/work/capacity-loss.ts dunne2013Loss()';

function c(symbol: string, name: string, value: number, unit: string, code: string): MethodConstant {
  return { symbol, name, value, unit, code };
}

const A_ACC = c('a_acc', 'intercept, acclimatized (REL)', LIMIT_CURVE_2017.acclimatized.intercept, '°C-WBGT', `${LC}#LIMIT_CURVE_2017.acclimatized.intercept`);
const B_ACC = c('b_acc', 'slope, acclimatized (REL)', LIMIT_CURVE_2017.acclimatized.slope, '°C-WBGT', `${LC}#LIMIT_CURVE_2017.acclimatized.slope`);
const A_UN = c(
  'a_un',
  'intercept, unacclimatized (RAL)',
  LIMIT_CURVE_2017.unacclimatized.intercept,
  '°C-WBGT',
  `${LC}#LIMIT_CURVE_2017.unacclimatized.intercept`,
);
const B_UN = c('b_un', 'slope, unacclimatized (RAL)', LIMIT_CURVE_2017.unacclimatized.slope, '°C-WBGT', `${LC}#LIMIT_CURVE_2017.unacclimatized.slope`);

const ISO_CLASSES = ['0', '1', '2', '3', '4'];
const TABLE_CONSTANTS: MethodConstant[] = [
  ...TABLE_1989_RATES.map((v, i) => c(`M_${ISO_CLASSES[i]}`, `typical rate of ISO class ${ISO_CLASSES[i]}`, v, 'W', `${LC}#TABLE_1989_RATES.${i}`)),
  ...(['acclimatized', 'unacclimatized'] as const).flatMap((acc) =>
    (['still', 'moving'] as const).flatMap((air) =>
      TABLE_1989_LIMITS[acc][air].map((v, i) =>
        c(
          `L_${ISO_CLASSES[i]},${acc === 'acclimatized' ? 'acc' : 'un'},${air}`,
          `class ${ISO_CLASSES[i]}, ${acc}, ${air === 'still' ? 'no perceptible air movement' : 'perceptible air movement'}`,
          v,
          '°C-WBGT',
          `${LC}#TABLE_1989_LIMITS.${acc}.${air}.${i}`,
        ),
      ),
    ),
  ),
];

const CAV_CONSTANTS: MethodConstant[] = [
  ...CLOTHING_ENSEMBLES.map((e, i) =>
    c(
      `CAV_${e.id}`,
      `${e.name} (${e.sourceTag === 'verified' ? 'value read in the source' : 'value from memory'})`,
      e.cav,
      '°C-WBGT',
      `pipeline/work/clothing.ts#CLOTHING_ENSEMBLES.${i}.cav`,
    ),
  ),
  c(
    'CAV_hood',
    `hood with any ensemble (${HOOD_CAV_SOURCE_TAG === 'verified' ? 'value read in the source' : 'value from memory'})`,
    HOOD_CAV,
    '°C-WBGT',
    'pipeline/work/clothing.ts#HOOD_CAV',
  ),
  c('CAV_max', 'largest clothing adjustment accepted', MAX_CAV, '°C-WBGT', 'pipeline/work/clothing.ts#MAX_CAV'),
];

const KJ = ([200, 300, 400] as const).flatMap((w) => [
  c(`μ_${w}`, `mean, ${w} W`, KJELLSTROM_2018[w].mean, '°C-WBGT', `pipeline/work/capacity-loss.ts#KJELLSTROM_2018.${w}.mean`),
  c(`σ_${w}`, `standard deviation, ${w} W`, KJELLSTROM_2018[w].sd, '°C-WBGT', `pipeline/work/capacity-loss.ts#KJELLSTROM_2018.${w}.sd`),
]);

const DN0 = c('W₀', 'WBGT below which no capacity is lost', 25, '°C-WBGT', DUNNE);
const DN1 = c('k', 'loss coefficient', 25, '% per °C^(2/3)', DUNNE);

const BIN_LO = c('W_lo', 'lower edge of the first closed bin', WBGT_BIN_LOWER, '°C', 'pipeline/work/wbgt-bins.ts#WBGT_BIN_LOWER');
const BIN_W = c('ΔW', 'bin width', WBGT_BIN_WIDTH, '°C', 'pipeline/work/wbgt-bins.ts#WBGT_BIN_WIDTH');
const BIN_N = c('n_bins', 'closed bins (plus one open bin at each end)', WBGT_BIN_COUNT, '–', 'pipeline/work/wbgt-bins.ts#WBGT_BIN_COUNT');

export const WORK_METHODS: MethodGroup = {
  id: 'work',
  title: 'From WBGT to working hours',
  intro:
    'Every hour, for every workload class, acclimatization state and exposure (sun or shade): the screening limit, whether the hour is above it, and the share of the hour that can be worked with the rest breaks the limit requires. The capacity-loss functions of the climate-impact literature are a second, population-level view.',
  methods: [
    {
      id: 'limit-curve',
      name: 'Screening limit (continuous curves)',
      summary:
        'The WBGT limit for a time-weighted metabolic rate, for acclimatized workers (recommended exposure limit) and for workers not used to the heat (recommended alert limit).',
      equation: [eq`L(M) = ${A_ACC} − ${B_ACC}·log₁₀ M   (acclimatized)`, eq`L(M) = ${A_UN} − ${B_UN}·log₁₀ M   (unacclimatized)`],
      symbols: [
        { symbol: 'M', meaning: 'metabolic rate, 1-hour time-weighted average, whole body', unit: 'W' },
        { symbol: 'L', meaning: 'screening limit, 1-hour time-weighted average WBGT', unit: '°C-WBGT' },
      ],
      constants: [
        A_ACC,
        B_ACC,
        A_UN,
        B_UN,
        c(
          'M_max',
          'largest metabolic rate accepted (larger values are taken as a mistake)',
          MAX_METABOLIC_RATE_W,
          'W',
          'pipeline/work/workload-classes.ts#MAX_METABOLIC_RATE_W',
        ),
      ],
      sources: ['niosh2016', 'iso7243-2017'],
      code: [`${LC} limitCurve2017()`],
      notes: ['Limit model "curve-2017". M is in W (a rate in W m⁻² times 1.8 m² gives W).'],
    },
    {
      id: 'limit-table-1989',
      name: 'Screening limit (ISO 7243:1989 table)',
      summary:
        'The alternative limit model "table-1989": the reference values per metabolic-rate class, linear in M between the classes\u2019 typical rates and flat outside them (our rule; at the typical rates it gives the table exactly).',
      equation: ['L(M) = L_k + (M − M_k)·(L_k+1 − L_k)/(M_k+1 − M_k)   for M_k ≤ M ≤ M_k+1;   L(M ≤ M_0) = L_0,   L(M ≥ M_4) = L_4'],
      symbols: [{ symbol: 'M_k, L_k', meaning: 'typical rate and reference value of ISO class k', unit: 'W, °C-WBGT' }],
      constants: TABLE_CONSTANTS,
      sources: ['iso7243-1989', 'iso8996'],
      code: [`${LC} limitTable1989(), piecewiseLinear()`],
    },
    {
      id: 'clothing',
      name: 'Clothing adjustment',
      summary:
        'Clothing that hinders the loss of heat is accounted for by adding a clothing adjustment value (CAV) to the WBGT, at work and at rest alike (the same clothes).',
      equation: ['WBGT_eff = WBGT + CAV'],
      symbols: [{ symbol: 'CAV', meaning: 'clothing adjustment value', unit: '°C-WBGT' }],
      constants: CAV_CONSTANTS,
      sources: ['acgih-tlv', 'bernard2008'],
      code: ['pipeline/work/clothing.ts clothingAdjustment()'],
      notes: [
        'Vapour-barrier coveralls use the larger ACGIH value (from memory) rather than the 10 kept by Bernard et al. 2008; such ensembles may need monitoring of the workers instead of a WBGT screen.',
      ],
    },
    {
      id: 'above-limit',
      name: 'Hours above the limit',
      summary:
        'An hour is above the limit when its effective WBGT at the work place exceeds the limit at the work rate; an hour exactly at the limit is not above it; an hour without a value is never above it.',
      equation: ['above ⇔ WBGT_w + CAV > L(M_w)', 'H_above = Σ over the hours of the month (all hours, or shift hours only) of 1[above]'],
      symbols: [
        { symbol: 'WBGT_w', meaning: 'WBGT at the work place (sun or shade)', unit: '°C' },
        { symbol: 'M_w', meaning: 'metabolic rate of the workload class', unit: 'W' },
        { symbol: 'H_above', meaning: 'hours above the limit in a month', unit: 'h' },
      ],
      constants: [],
      sources: ['niosh2016', 'iso7243-2017'],
      code: ['pipeline/work/work-fraction.ts isAboveLimit(), workFractionInto()'],
    },
    {
      id: 'work-fraction',
      name: 'Allowable work fraction and hours lost',
      summary:
        'The largest share f of an hour that can be worked at M_w, resting the remainder at M_r, so that the hour\u2019s time-weighted WBGT stays within the limit at the hour\u2019s time-weighted metabolic rate. The rest of the hour is lost to rest breaks.',
      equation: [
        'f·WBGT_w + (1 − f)·WBGT_r + CAV ≤ L(f·M_w + (1 − f)·M_r)',
        'rest in the same place, curve model:   M_lim = 10^((a − WBGT_eff)/b),   f = (M_lim − M_r)/(M_w − M_r), clipped to [0, 1]',
        'rest in the shade: the same inequality solved for f by Newton\u2019s method (monotone from the left)',
        'H_lost = Σ over the shift hours of the month of (1 − f)',
      ],
      symbols: [
        { symbol: 'f', meaning: 'allowable work fraction of the hour', unit: '0–1' },
        { symbol: 'M_w, M_r', meaning: 'metabolic rate at work and at rest', unit: 'W' },
        { symbol: 'WBGT_r', meaning: 'WBGT where breaks are taken (at most the work WBGT)', unit: '°C' },
        { symbol: 'a, b', meaning: 'intercept and slope of the limit curve', unit: '°C-WBGT' },
        { symbol: 'H_lost', meaning: 'hours lost to rest breaks per worker in a month', unit: 'h' },
      ],
      constants: [],
      sources: ['niosh2016', 'iso7243-2017'],
      code: ['pipeline/work/work-fraction.ts prepareWorkKernel(), allowableWorkFraction(), workFractionInto()'],
      notes: [
        'This is the inversion in the time-weighted metabolic rate. The more permissive variant that interpolates between the limits at the rest and work rates (Bröde et al. 2018) is not used.',
        'With the 1989 table the limit is piecewise linear in M and f is found exactly, segment by segment.',
      ],
    },
    {
      id: 'shift-hours',
      name: 'Shift hours in local time',
      summary: 'Shift figures count only the hours of the work shift, in the atlas\u2019s time zone (daylight saving from the time-zone database).',
      equation: ['in shift ⇔ the whole hour, in local clock time, lies inside one shift: shift start ≤ local start and local end ≤ shift end, on a listed day'],
      symbols: [
        { symbol: 'local start, local end', meaning: 'the hour\u2019s start and end in local time (data are stamped at the end of the hour, UTC)', unit: 'h' },
      ],
      constants: [],
      sources: ['ecmwf-era5'],
      code: ['pipeline/work/shifts.ts localHours(), localHoursInto()'],
      notes: ['A night shift (end before start) counts for the day it starts. In a zone with a half-hour offset a 07–17 shift holds 9 whole hours.'],
    },
    {
      id: 'capacity-loss-kjellstrom',
      name: 'Capacity loss (Kjellstrom et al. 2018)',
      summary:
        'The share of an hour\u2019s work capacity lost at a WBGT, as a cumulative normal per work intensity: a population-level estimate from the climate-impact literature, not work/rest advice.',
      equation: ['loss(WBGT) = Φ((WBGT − μ)/σ) = ½·[1 + erf((WBGT − μ)/(σ·√2))]', 'capacity-loss hours = Σ over the shift hours of loss(WBGT + CAV)'],
      symbols: [
        { symbol: 'Φ', meaning: 'standard normal distribution function', unit: '–' },
        { symbol: 'μ, σ', meaning: 'mean and standard deviation per intensity (200, 300, 400 W)', unit: '°C-WBGT' },
      ],
      constants: KJ,
      sources: ['kjellstrom2018', 'brode2018'],
      code: [
        'pipeline/work/capacity-loss.ts kjellstrom2018Loss(), kjellstrom2018LossInto()',
        'pipeline/work/erf.ts normalCdf(), normalCdfFast()',
        'pipeline/reduce/accumulator.ts (lossCav)',
      ],
      notes: [
        'Clothing: the loss functions describe workers in ordinary light work clothes (the companion study of Bröde et al. 2018 states 0.6 clo, "light work clothes"). The clothing adjustment value is the WBGT increment that makes an ensemble count like such clothes, so the functions are given the effective WBGT, WBGT + CAV; with work clothes (CAV 0) that is the bare WBGT. Measured on the demo: see "Modelling choices and their effect on the demo".',
      ],
    },
    {
      id: 'capacity-loss-dunne',
      name: 'Capacity loss for heavy work (Dunne et al. 2013)',
      summary: 'The share of capacity lost in heavy work at a WBGT, a second loss function from the climate-impact literature.',
      equation: [eq`capacity [%] = 100 − ${DN1}·max(0, WBGT − ${DN0})^(2/3), clipped to [0, 100];   loss = 1 − capacity/100`],
      symbols: [{ symbol: 'WBGT', meaning: 'hourly WBGT (+ CAV)', unit: '°C' }],
      constants: [DN0, DN1],
      sources: ['dunne2013'],
      code: [`${DUNNE}, dunne2013LossInto()`],
      notes: [
        'Dunne et al. applied it to daily maximum WBGT; here it is applied to each shift hour, at the effective WBGT (WBGT + CAV) like the Kjellstrom functions.',
      ],
    },
    {
      id: 'histogram-estimate',
      name: 'Estimates from WBGT histograms (the calculator)',
      summary:
        'The calculator works from counts of hours per WBGT bin instead of the hours themselves. Hours are taken as spread evenly within a bin; the bin holding the threshold counts the share above it.',
      equation: [
        'threshold = L(M_w) − CAV',
        'hours above from a bin [lower, upper) holding the threshold = count·(upper − threshold)/(upper − lower)',
        'hours lost per bin = hours above × (1 − f) at the middle of the part above the threshold',
      ],
      symbols: [{ symbol: 'count', meaning: 'hours in the bin', unit: 'h' }],
      constants: [BIN_LO, BIN_W, BIN_N],
      sources: [],
      code: ['pipeline/work/histogram-estimate.ts estimateFromHistogram()', 'pipeline/work/wbgt-bins.ts'],
    },
  ],
};
