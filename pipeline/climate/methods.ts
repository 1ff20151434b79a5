/**
 * The climate stage's rules as the methods page shows them: normals across years, completeness,
 * the annual mean temperature and the human climate niche, with constants and sources
 * (pipeline/model/sources.ts). Exported constants are imported; the quantile probabilities are
 * written inside computeNormals() and test/climate/methods.test.ts checks them against it.
 */
import { eq, type MethodConstant, type MethodGroup } from '../model/sources.ts';
import { MONTHLY_COMPLETENESS } from './completeness.ts';
import { MIN_TREND_YEARS, YEARS_PER_DECADE } from './trend.ts';
import { NICHE_BOUNDS, NICHE_MAIN_MODE_C, NICHE_UNCERTAINTY_C } from './niche.ts';

function c(symbol: string, name: string, value: number, unit: string, code: string): MethodConstant {
  return { symbol, name, value, unit, code };
}

const NORMALS = 'pipeline/climate/normals.ts computeNormals()';
const P50 = c('p_median', 'probability of the median', 0.5, '–', NORMALS);
const P90 = c('p_90', 'probability of the 90th-percentile year', 0.9, '–', NORMALS);
const MISS = c(
  'h_miss',
  'most missing hours for a month to count (10 days)',
  MONTHLY_COMPLETENESS.maxMissingHours,
  'h',
  'pipeline/climate/completeness.ts#MONTHLY_COMPLETENESS.maxMissingHours',
);
const SHARE = c(
  's_years',
  'smallest share of the baseline years for a normal',
  MONTHLY_COMPLETENESS.minYearShare,
  '–',
  'pipeline/climate/completeness.ts#MONTHLY_COMPLETENESS.minYearShare',
);
const NB = (key: keyof typeof NICHE_BOUNDS, symbol: string, name: string) =>
  c(symbol, name, NICHE_BOUNDS[key], '°C', `pipeline/climate/niche.ts#NICHE_BOUNDS.${key}`);
const CORE_LO = NB('coreLow', 'T_core,lo', 'lower edge of the main band');
const CORE_HI = NB('coreHigh', 'T_core,hi', 'upper edge of the main band');
const SEC_LO = NB('secondLow', 'T_second,lo', 'lower edge of the second band');
const SEC_HI = NB('secondHigh', 'T_second,hi', 'upper edge of the second band');
const OUT = NB('outsideFrom', 'T_out', 'mean annual temperature from which a cell is outside the niche');
const MODE = c('T_mode', 'main mode of the niche', NICHE_MAIN_MODE_C, '°C', 'pipeline/climate/niche.ts#NICHE_MAIN_MODE_C');
const TREND_MIN = c('n_min', 'fewest years with a value for a trend to be shown', MIN_TREND_YEARS, 'years', 'pipeline/climate/trend.ts#MIN_TREND_YEARS');
const DECADE = c('D', 'years in a decade (slopes are shown per decade)', YEARS_PER_DECADE, 'years', 'pipeline/climate/trend.ts#YEARS_PER_DECADE');
const NEAR = c('ΔT_edge', 'half-width of the uncertain band around each edge', NICHE_UNCERTAINTY_C, '°C', 'pipeline/climate/niche.ts#NICHE_UNCERTAINTY_C');

export const CLIMATE_METHODS: MethodGroup = {
  id: 'climate',
  title: 'Across years: normals and the human climate niche',
  intro:
    'Monthly and annual figures of each year are summarised over the baseline years; the latest year is compared with them. The mean annual temperature of each cell is placed against the range of climates people have historically lived in.',
  methods: [
    {
      id: 'quantiles',
      name: 'Median and 90th-percentile year',
      summary:
        'Quantiles of the baseline years\u2019 values by linear interpolation between order statistics (Hyndman–Fan type 7, the default of R and numpy).',
      equation: [
        'sort x(1) ≤ … ≤ x(n);   h = (n − 1)·p + 1',
        'Q(p) = x(⌊h⌋) + (h − ⌊h⌋)·(x(⌊h⌋+1) − x(⌊h⌋))',
        eq`median = Q(${P50}),   90th-percentile year = Q(${P90}) (exceeded in about 1 year in 10)`,
      ],
      symbols: [
        { symbol: 'x(i)', meaning: 'the i-th smallest value of the years that count', unit: 'unit of the figure' },
        { symbol: 'n', meaning: 'years that count', unit: 'years' },
      ],
      constants: [P50, P90],
      sources: ['hyndman1996'],
      code: ['pipeline/climate/quantile.ts quantileSorted()', NORMALS],
    },
    {
      id: 'normals',
      name: 'Baseline mean, lowest and highest year, the latest year',
      summary:
        'The mean, lowest and highest value of the baseline years that count; the latest year\u2019s value, its difference from the baseline mean and its rank among the baseline years.',
      equation: [
        'mean = (1/n)·Σ x_y over the baseline years y that count',
        'difference = x_latest − mean;   rank = 1 + (number of baseline years above x_latest)',
      ],
      symbols: [{ symbol: 'x_y', meaning: 'the figure in year y', unit: 'unit of the figure' }],
      constants: [],
      sources: ['wmo1203'],
      code: [NORMALS],
    },
    {
      id: 'completeness',
      name: 'When a year counts, and when a normal is published',
      summary:
        'A month counts only when few of its hours are missing; a normal is published only when enough baseline years count, otherwise it is left empty, never computed from too few years.',
      equation: ['a year counts ⇔ hours expected − hours computed ≤ h_miss', 'a normal is published ⇔ years that count ≥ ⌈s_years · length of the baseline⌉'],
      symbols: [],
      constants: [MISS, SHARE],
      sources: ['wmo1203'],
      code: ['pipeline/climate/completeness.ts yearCounts(), minYearsForNormal(), completenessMask()'],
      notes: ['The WMO rule\u2019s second part (fewer than 5 consecutive missing days) cannot be checked from hour counts and is not applied.'],
    },
    {
      id: 'annual-mean-temperature',
      name: 'Mean annual temperature',
      summary: 'The mean of the hourly 2 m air temperature over a year, each month weighted by the hours it holds; a year needs all 12 months.',
      equation: ['MAT_y = Σ_m mean_m·E_m / Σ_m E_m,   mean_m = Σ hourly T_a / hours computed', 'baseline MAT = mean of MAT_y over the baseline years'],
      symbols: [
        { symbol: 'E_m', meaning: 'hours in month m', unit: 'h' },
        { symbol: 'MAT', meaning: 'mean annual temperature', unit: '°C' },
      ],
      constants: [MISS],
      sources: ['wmo1203'],
      code: ['pipeline/climate/annual-mean.ts annualMeanFromMonthlySums()'],
    },
    {
      id: 'trend',
      name: 'The trend of the record',
      summary:
        'How fast a figure\u2019s annual value has changed over the built years: the Theil–Sen slope (the median of the slopes between every pair of years, little moved by one extreme year) per decade, with the p-value of the Mann–Kendall test of a monotonic trend. A trend of the past record, not a projection.',
      equation: [
        eq`slope = ${DECADE} · median over i < j of (x_j − x_i)/(t_j − t_i)   [unit of the figure per decade]`,
        'S = Σ_{i<j} sign(x_j − x_i);   Var S = [n(n − 1)(2n + 5) − Σ_g t_g(t_g − 1)(2t_g + 5)]/18',
        'Z = S/√(Var S);   p = erfc(|Z|/√2)  (two-sided, normal approximation)',
        eq`shown only where n ≥ ${TREND_MIN}`,
      ],
      symbols: [
        { symbol: 'x_i, t_i', meaning: 'the annual value and its year, over the years with a value', unit: 'unit of the figure, year' },
        { symbol: 'n', meaning: 'years with a value', unit: 'years' },
        { symbol: 't_g', meaning: 'size of a group of equal values', unit: '–' },
      ],
      constants: [DECADE, TREND_MIN],
      sources: ['sen1968', 'mann1945', 'kendall1975'],
      code: ['pipeline/climate/trend.ts theilSenSlope(), mannKendall(), computeTrends()'],
      notes: [
        'The minimum of 15 years is ours: over fewer years the slope mostly reflects which years happened to be hot. A small p-value says the values rise or fall more steadily than chance would give; it says nothing about the cause.',
      ],
    },
    {
      id: 'niche',
      name: 'The human climate niche',
      summary:
        'Where a cell\u2019s mean annual temperature falls against the temperatures people have mostly lived in: a screening description built on published statements, not a fitted population density.',
      equation: [
        eq`main band: ${CORE_LO} °C ≤ MAT ≤ ${CORE_HI} °C;   second band: ${SEC_LO} °C ≤ MAT ≤ ${SEC_HI} °C`,
        eq`outside: MAT ≥ ${OUT} °C;   margin: any other MAT below ${OUT} °C`,
        eq`distance to the main mode = MAT − ${MODE} °C;   near an edge ⇔ |MAT − edge| ≤ ${NEAR} °C`,
      ],
      symbols: [{ symbol: 'MAT', meaning: 'baseline mean annual temperature of the cell', unit: '°C' }],
      constants: [CORE_LO, CORE_HI, SEC_LO, SEC_HI, OUT, MODE, NEAR],
      sources: ['xu2020', 'lenton2023'],
      code: ['pipeline/climate/niche.ts nicheClassCode(), nearNicheBoundary()', 'pipeline/climate/niche-assessment.ts assessNiche()'],
      notes: [
        'Both studies used other climate datasets and averaged over 20 years or more; a grid-box mean within about half a degree of an edge could fall on either side.',
      ],
    },
  ],
};
