/**
 * The bibliography of the pipeline: every published source a formula, constant, rule or caution
 * of heathours rests on, with a stable id, and the shape of the method descriptors that cite them
 * (pipeline/physics/methods.ts, pipeline/work/methods.ts, pipeline/climate/methods.ts,
 * pipeline/regions/methods.ts). The site's methods page renders both, so the page shows what the
 * code uses.
 *
 * `checked` says, for each entry, what of it and of the values taken from it was read in the
 * source or in a named reproduction of it, and what is still from memory; the methods page lists
 * the unverified items together (UNVERIFIED below). Pure data, no imports: the browser calculator
 * may import the work stage, which imports this file.
 */

/** One published source. */
export interface Source {
  id: SourceId;
  /** Short citation, e.g. "Liljegren et al. 2008". */
  cite: string;
  /** Authors or issuing body, as they are usually cited. */
  authors: string;
  year: number | null;
  title: string;
  /** Journal with volume and pages, publisher, or standard number. */
  publication: string;
  /** DOI (bare, `10.…`) when known. */
  doi?: string;
  /** What of this entry, and of the values taken from it, was read in the source and what is from memory. */
  checked: string;
}

export const SOURCE_IDS = [
  'liljegren2008',
  'buck1981',
  'bsl1960',
  'bedingfield1950',
  'oke1987',
  'michalsky1988',
  'meeus1998',
  'reda2008',
  'epa2000',
  'iso7243-2017',
  'iso7243-1989',
  'parsons2006',
  'osha-otm',
  'oliveira2019',
  'lemke2012',
  'iso8996',
  'niosh2016',
  'acgih-tlv',
  'bernard2008',
  'kjellstrom2018',
  'brode2018',
  'dunne2013',
  'hyndman1996',
  'wmo1203',
  'sen1968',
  'mann1945',
  'kendall1975',
  'xu2020',
  'lenton2023',
  'ecmwf-era5',
  'hersbach2020',
  'munoz-sabater2021',
  'natural-earth',
] as const;

export type SourceId = (typeof SOURCE_IDS)[number];

export const SOURCES: readonly Source[] = [
  {
    id: 'liljegren2008',
    cite: 'Liljegren et al. 2008',
    authors: 'Liljegren, J. C., Carhart, R. A., Lawday, P., Tschopp, S. and Sharp, R.',
    year: 2008,
    title: 'Modeling the wet bulb globe temperature using standard meteorological measurements',
    publication: 'Journal of Occupational and Environmental Hygiene 5(10):645–655; reference C code WBGT v1.1 (Argonne National Laboratory)',
    checked:
      "Equations and constants read in the v1.1 reference C code (WBGT v1.1, Argonne); the paper's text was not read (its abstract was: outdoor WBGT from standard measurements, within 1 °C of measured WBGT); author list from memory.",
  },
  {
    id: 'buck1981',
    cite: 'Buck 1981',
    authors: 'Buck, A. L.',
    year: 1981,
    title: 'New equations for computing vapor pressure and enhancement factor',
    publication: 'Journal of Applied Meteorology 20:1527–1532',
    checked:
      'Coefficients read as used in the Liljegren reference code (esat(), "Buck\'s (1981) approximation (eqn 3)"); checked against the CRC Handbook of Chemistry and Physics (1992–93) table "Vapor pressure of water" within 0.1 % over 0–40 °C.',
  },
  {
    id: 'bsl1960',
    cite: 'Bird, Stewart & Lightfoot 1960',
    authors: 'Bird, R. B., Stewart, W. E. and Lightfoot, E. N.',
    year: 1960,
    title: 'Transport Phenomena',
    publication: 'Wiley, New York (viscosity of gases, heat transfer from a sphere, p. 409)',
    checked: 'Viscosity and sphere heat-transfer formulas as coded in the Liljegren reference code; the book itself was not read.',
  },
  {
    id: 'bedingfield1950',
    cite: 'Bedingfield & Drew 1950',
    authors: 'Bedingfield, C. H. and Drew, T. B.',
    year: 1950,
    title: 'Analogy between heat transfer and mass transfer: a psychrometric study',
    publication: 'Industrial and Engineering Chemistry 42:1164–1173',
    checked: 'Cylinder heat-transfer correlation as coded in the Liljegren reference code; title, journal and pages from memory.',
  },
  {
    id: 'oke1987',
    cite: 'Oke 1987',
    authors: 'Oke, T. R.',
    year: 1987,
    title: 'Boundary Layer Climates (2nd edition)',
    publication: 'Methuen, London',
    checked: 'Atmospheric emissivity formula as coded in the Liljegren reference code; edition and year from memory.',
  },
  {
    id: 'michalsky1988',
    cite: 'Michalsky 1988',
    authors: 'Michalsky, J. J.',
    year: 1988,
    title: "The Astronomical Almanac's algorithm for approximate solar position (1950–2050)",
    publication: 'Solar Energy 40(3):227–235',
    checked:
      'Formulas as used in the Liljegren reference code (1950–2049); kept for the comparison with the Meeus formulas over those years (cos z within 10⁻⁴).',
  },
  {
    id: 'meeus1998',
    cite: 'Meeus 1998',
    authors: 'Meeus, J.',
    year: 1998,
    title: 'Astronomical Algorithms (2nd edition)',
    publication: 'Willmann-Bell, Richmond, Virginia; ch. 12 (sidereal time), ch. 22 (obliquity), ch. 25 (solar coordinates, low accuracy)',
    checked:
      "The formulas and their coefficients are from memory of the book and of NOAA's solar calculator, which uses them; checked by their results against the NREL SPA report's example and PyEphem 4.1.4 over 1900–2100 (test/physics/sun-position.test.ts).",
  },
  {
    id: 'reda2008',
    cite: 'Reda & Andreas 2008',
    authors: 'Reda, I. and Andreas, A.',
    year: 2008,
    title: 'Solar position algorithm for solar radiation applications (revised)',
    publication: 'National Renewable Energy Laboratory, NREL/TP-560-34302 (first published 2004, Solar Energy 76:577–589)',
    checked:
      "The report's example values (2003-10-17, Golden, Colorado: declination −9.31434°, right ascension 202.22741°, hour angle 11.10590°, distance 0.9965422974 AU) as reproduced in the test case of an open-source implementation and agreeing with PyEphem 4.1.4; the report itself was not read.",
  },
  {
    id: 'epa2000',
    cite: 'US EPA 2000',
    authors: 'U.S. Environmental Protection Agency',
    year: 2000,
    title: 'Meteorological Monitoring Guidance for Regulatory Modeling Applications',
    publication: 'EPA-454/R-99-005, §6.2.5 (wind power law by stability class)',
    checked: 'Exponents and the stability-class table as coded in the Liljegren reference code; the guidance document itself was not read.',
  },
  {
    id: 'iso7243-2017',
    cite: 'ISO 7243:2017',
    authors: 'International Organization for Standardization',
    year: 2017,
    title: 'Ergonomics of the thermal environment — Assessment of heat stress using the WBGT (wet bulb globe temperature) index',
    publication: 'ISO 7243:2017',
    checked:
      "Scope read in the catalogue abstract (screening over a working day, fit adults). The standard's text was not read: the WBGT weighting 0.7·T_nw + 0.2·T_g + 0.1·T_a and the 150 mm standard globe are as Parsons (2006) describes the standard; the continuous limit curves as NIOSH 2016 gives them (secondary).",
  },
  {
    id: 'iso7243-1989',
    cite: 'ISO 7243:1989',
    authors: 'International Organization for Standardization',
    year: 1989,
    title: 'Hot environments — Estimation of the heat stress on working man, based on the WBGT-index (wet bulb globe temperature)',
    publication: 'ISO 7243:1989',
    checked:
      "Reference values read in the standard's table (classes 0–4, acclimatized and not, with and without air movement) as reproduced in an instrument manual.",
  },
  {
    id: 'parsons2006',
    cite: 'Parsons 2006',
    authors: 'Parsons, K.',
    year: 2006,
    title: 'Heat stress standard ISO 7243 and its global application',
    publication: 'Industrial Health 44:368–379',
    checked:
      'Read (abstract and the description of the index): t_g is the temperature of the 150 mm diameter black globe; outdoor WBGT = 0.7·t_nw + 0.2·t_g + 0.1·t_a.',
  },
  {
    id: 'osha-otm',
    cite: 'OSHA Technical Manual',
    authors: 'U.S. Occupational Safety and Health Administration',
    year: null,
    title: 'OSHA Technical Manual, Section III, Chapter 4: Heat Stress',
    publication: 'TED 01-00-015',
    checked:
      'The WBGT instrument text read in a reproduction: a globe thermometer of a 15 cm (6-inch) hollow copper sphere painted matte black, exposed at least 25 minutes before reading.',
  },
  {
    id: 'oliveira2019',
    cite: 'Oliveira et al. 2019',
    authors: 'Oliveira, A. V. M., Raimundo, A. M., Gaspar, A. R. and Quintela, D. A.',
    year: 2019,
    title: 'Globe temperature and its measurement: requirements and limitations',
    publication: 'Annals of Work Exposures and Health 63(7):743–758',
    doi: '10.1093/annweh/wxz042',
    checked: 'Abstract read: 50 and 150 mm globes differ by more than 20 °C in some tests; the 150 mm globe is the standard one.',
  },
  {
    id: 'lemke2012',
    cite: 'Lemke & Kjellstrom 2012',
    authors: 'Lemke, B. and Kjellstrom, T.',
    year: 2012,
    title: 'Calculating workplace WBGT from meteorological data: a tool for climate change assessment',
    publication: 'Industrial Health 50:267–278',
    checked:
      'Abstract read (Liljegren et al. 2008 recommended outdoors, Bernard et al. 1999 indoors); that their indoor/shade WBGT takes the globe at the air temperature (no radiant source) is from memory of the paper and of public code citing it.',
  },
  {
    id: 'iso8996',
    cite: 'ISO 8996',
    authors: 'International Organization for Standardization',
    year: 2004,
    title: 'Ergonomics of the thermal environment — Determination of metabolic rate',
    publication: 'ISO 8996',
    checked: 'Class boundaries read via the ISO 7243:1989 table; typical values and task examples from memory; year of the edition from memory.',
  },
  {
    id: 'niosh2016',
    cite: 'NIOSH 2016',
    authors: 'Jacklitsch, B. et al. (National Institute for Occupational Safety and Health)',
    year: 2016,
    title: 'Criteria for a Recommended Standard: Occupational Exposure to Heat and Hot Environments',
    publication: 'DHHS (NIOSH) Publication No. 2016-106',
    checked:
      'Title, authors (Jacklitsch, Williams, Musolin, Coca, Kim, Turner), publication number and date read in the NIOSHTIC-2 record; that NIOSH and ACGIH criteria are the same, read in a NIOSH health hazard evaluation report. The REL and RAL curves were read in public code and in code comments citing §8.1, not in the document itself.',
  },
  {
    id: 'acgih-tlv',
    cite: 'ACGIH TLV',
    authors: 'American Conference of Governmental Industrial Hygienists',
    year: null,
    title: 'Heat Stress and Strain: TLV® documentation (clothing adjustment values)',
    publication: 'ACGIH, Cincinnati',
    checked:
      'List of ensembles read in a reproduction; that cotton work uniforms need no clothing adjustment, read in a NIOSH health hazard evaluation citing ACGIH 2014; the other ACGIH values are from memory, as listed on the methods page.',
  },
  {
    id: 'bernard2008',
    cite: 'Bernard et al. 2008',
    authors: 'Bernard, T. E., Caravello, V., Schwartz, S. W. and Ashley, C. D.',
    year: 2008,
    title: 'WBGT clothing adjustment factors for four clothing ensembles and the effects of metabolic demands',
    publication: 'Journal of Occupational and Environmental Hygiene 5(1):1–5',
    doi: '10.1080/15459620701732355',
    checked:
      'Title, pages, DOI and the abstract read at the publisher: factors measured against a baseline of cotton work clothes, 0 for cotton coveralls, 1.0 for Tyvek 1422A, 2.5 for NexGen, 7.5 measured for Tychem QC with the recommendation kept at 10, independent of metabolic rate. Author list from memory.',
  },
  {
    id: 'kjellstrom2018',
    cite: 'Kjellstrom et al. 2018',
    authors: 'Kjellstrom, T. et al.',
    year: 2018,
    title: 'Estimating population heat exposure and impacts on working people in conjunction with climate change',
    publication: 'International Journal of Biometeorology 62:291–306',
    doi: '10.1007/s00484-017-1407-0',
    checked: 'μ and σ read in two independent public research codes; the paper itself was not read; volume, pages and title from memory.',
  },
  {
    id: 'brode2018',
    cite: 'Bröde et al. 2018',
    authors: 'Bröde, P., Fiala, D., Lemke, B. and Kjellstrom, T.',
    year: 2018,
    title: 'Estimated work ability in warm outdoor environments depends on the chosen heat stress assessment metric',
    publication: 'International Journal of Biometeorology 62:331–345',
    doi: '10.1007/s00484-017-1346-9',
    checked: 'Title, authors, DOI and the abstract read: an acclimated person wearing light work clothes (0.6 clo) is assumed. Volume and pages from memory.',
  },
  {
    id: 'dunne2013',
    cite: 'Dunne et al. 2013',
    authors: 'Dunne, J. P., Stouffer, R. J. and John, J. G.',
    year: 2013,
    title: 'Reductions in labour capacity from heat stress under climate warming',
    publication: 'Nature Climate Change 3:563–566',
    checked:
      "Formula read in a public library's source and docstring; the paper was not read (its basis in NIOSH and military work–rest guidance for heavy work is from memory); title from memory.",
  },
  {
    id: 'hyndman1996',
    cite: 'Hyndman & Fan 1996',
    authors: 'Hyndman, R. J. and Fan, Y.',
    year: 1996,
    title: 'Sample quantiles in statistical packages',
    publication: 'The American Statistician 50(4):361–365',
    checked: 'Type 7 as the default of R and numpy (numpy.quantile, method "linear"); journal details from memory.',
  },
  {
    id: 'wmo1203',
    cite: 'WMO-No. 1203',
    authors: 'World Meteorological Organization',
    year: 2017,
    title: 'WMO Guidelines on the Calculation of Climate Normals',
    publication: 'WMO-No. 1203',
    checked: 'Title read; the completeness rules used here (≤ 10 missing days a month, ≥ 80 % of years) are from memory.',
  },
  {
    id: 'sen1968',
    cite: 'Sen 1968',
    authors: 'Sen, P. K.',
    year: 1968,
    title: "Estimates of the regression coefficient based on Kendall's tau",
    publication: 'Journal of the American Statistical Association 63(324):1379–1389',
    doi: '10.1080/01621459.1968.10480934',
    checked:
      "The estimator (median of the pairwise slopes) as SciPy's theilslopes documentation describes and cites it; the paper was not read; volume, pages and DOI from memory.",
  },
  {
    id: 'mann1945',
    cite: 'Mann 1945',
    authors: 'Mann, H. B.',
    year: 1945,
    title: 'Nonparametric tests against trend',
    publication: 'Econometrica 13(3):245–259',
    doi: '10.2307/1907187',
    checked:
      "The test statistic S and its normal approximation from memory, checked against SciPy's kendalltau (the same test with time as the second variable); the paper was not read; volume, pages and DOI from memory.",
  },
  {
    id: 'kendall1975',
    cite: 'Kendall 1975',
    authors: 'Kendall, M. G.',
    year: 1975,
    title: 'Rank Correlation Methods',
    publication: 'Charles Griffin, London, 4th edition',
    checked:
      "The variance of S with the correction for tied values from memory, checked against SciPy's kendalltau; the book was not read; edition and publisher from memory.",
  },
  {
    id: 'xu2020',
    cite: 'Xu et al. 2020',
    authors: 'Xu, C., Kohler, T. A., Lenton, T. M., Svenning, J.-C. and Scheffer, M.',
    year: 2020,
    title: 'Future of the human climate niche',
    publication: 'Proceedings of the National Academy of Sciences 117:11350–11355',
    doi: '10.1073/pnas.1910114117',
    checked: 'Modes and the 29 °C statement read in the abstract; volume, pages and DOI from memory.',
  },
  {
    id: 'lenton2023',
    cite: 'Lenton et al. 2023',
    authors: 'Lenton, T. M. et al.',
    year: 2023,
    title: 'Quantifying the human cost of global warming',
    publication: 'Nature Sustainability 6:1237–1247',
    doi: '10.1038/s41893-023-01132-6',
    checked: 'The 29 °C threshold read in the abstract; the 20-year averaging of mean annual temperature read in the caption of Fig. 2.',
  },
  {
    id: 'ecmwf-era5',
    cite: 'ECMWF ERA5 documentation',
    authors: 'European Centre for Medium-Range Weather Forecasts',
    year: null,
    title: 'ERA5 and ERA5-Land data documentation (accumulations, grids, parameters)',
    publication: 'ECMWF Confluence pages',
    checked: 'Accumulation conventions (over the hour ending at the time stamp), units and grids read in the ECMWF Confluence documentation.',
  },
  {
    id: 'hersbach2020',
    cite: 'Hersbach et al. 2020',
    authors: 'Hersbach, H. et al.',
    year: 2020,
    title: 'The ERA5 global reanalysis',
    publication: 'Quarterly Journal of the Royal Meteorological Society 146:1999–2049',
    doi: '10.1002/qj.3803',
    checked: 'Citation from memory.',
  },
  {
    id: 'munoz-sabater2021',
    cite: 'Muñoz-Sabater et al. 2021',
    authors: 'Muñoz-Sabater, J. et al.',
    year: 2021,
    title: 'ERA5-Land: a state-of-the-art global reanalysis dataset for land applications',
    publication: 'Earth System Science Data 13:4349–4383',
    doi: '10.5194/essd-13-4349-2021',
    checked: 'Citation from memory.',
  },
  {
    id: 'natural-earth',
    cite: 'Natural Earth',
    authors: 'Natural Earth',
    year: null,
    title: 'Natural Earth 1:110m land and country outlines (via the world-atlas 2.0.2 package)',
    publication: 'naturalearthdata.com, public domain',
    checked: 'Public-domain status as the package states it.',
  },
];

/** One value or statement the pipeline uses that was not verified against its source text. */
export interface UnverifiedItem {
  /** What it is, in a few words. */
  what: string;
  /** The source it should be checked against. */
  source: SourceId;
  /** What is known and how. */
  status: string;
}

/**
 * What is still unverified, in one list (the methods page shows it under that title; the
 * clothing values from memory are added there from pipeline/work/clothing.ts).
 */
export const UNVERIFIED: readonly UnverifiedItem[] = [
  {
    what: 'WBGT weights 0.7 / 0.2 / 0.1 and the standard globe of ISO 7243',
    source: 'iso7243-2017',
    status: "read in Parsons (2006), which describes the standard; the standard's text was not read",
  },
  {
    what: 'Screening limit curves L(M) = 56.7 − 11.5·log₁₀ M (acclimatized) and 59.9 − 14.1·log₁₀ M (unacclimatized)',
    source: 'niosh2016',
    status: 'read in public code and in code comments citing the criteria document; not read in the document',
  },
  {
    what: 'Capacity-loss means and standard deviations per work intensity',
    source: 'kjellstrom2018',
    status: 'read in two independent public research codes; the paper was not read',
  },
  {
    what: 'Capacity loss for heavy work, 100 − 25·(WBGT − 25)^(2/3) %, and its basis',
    source: 'dunne2013',
    status: 'formula read in a public library; the paper was not read',
  },
  {
    what: "The indoor/in-shade WBGT takes the globe at the air temperature (the sheltered exposure's assumption)",
    source: 'lemke2012',
    status: 'abstract read; the assumption is from memory of the paper and of public code citing it',
  },
  {
    what: 'Coefficients of the low-accuracy solar coordinates',
    source: 'meeus1998',
    status: 'from memory; their results agree with the NREL SPA example and with PyEphem over 1900–2100 (tested)',
  },
  {
    what: 'Typical metabolic rates per ISO class and the task examples of the workload classes',
    source: 'iso8996',
    status: 'class boundaries read via ISO 7243:1989; typical values and examples from memory',
  },
  {
    what: 'Variance of the Mann–Kendall statistic with tied values',
    source: 'kendall1975',
    status: "from memory; agrees with SciPy's kendalltau on tied series (tested)",
  },
  { what: 'Completeness rules for normals (≤ 10 missing days a month, ≥ 80 % of the years)', source: 'wmo1203', status: 'from memory' },
  {
    what: 'Stability-class power-law exponents of the 2 m wind',
    source: 'epa2000',
    status: 'as coded in the Liljegren reference code; the guidance document was not read',
  },
];

/** The source with this id (every id of {@link SOURCE_IDS} has one; a test checks it). */
export function sourceById(id: SourceId): Source {
  const s = SOURCES.find((x) => x.id === id);
  if (!s) throw new Error(`no source "${id}"`);
  return s;
}

/** A constant a method uses, as the methods page shows it. */
export interface MethodConstant {
  symbol: string;
  name: string;
  /** The value the code uses [unit]. */
  value: number;
  unit: string;
  /**
   * Where the code holds it: `pipeline/…/file.ts#EXPORT` or `#EXPORT.key.0` for an exported
   * constant (the descriptor imports it), or `pipeline/…/file.ts fn()` for a number written inside
   * that function (a test evaluates the method with the listed values against the function).
   */
  code: string;
  /** For a value computed from other constants: how (shown beside it). */
  derived?: string;
}

/** A symbol of an equation with its meaning and unit. */
export interface MethodSymbol {
  symbol: string;
  meaning: string;
  unit: string;
}

/** One formula or rule of the pipeline, as the methods page shows it. */
export interface MethodDescriptor {
  /** Stable id (an anchor on the methods page). */
  id: string;
  name: string;
  /** What it computes and where it is used, in a sentence or two. */
  summary: string;
  /** The equation, one line per entry, plain text with Unicode symbols. */
  equation: string[];
  symbols: MethodSymbol[];
  constants: MethodConstant[];
  sources: SourceId[];
  /** The code that computes it: `pipeline/…/file.ts fn()`. */
  code: string[];
  /** Decisions, ranges of validity, differences from the source. */
  notes?: string[];
}

/** A group of methods (one per pipeline stage). */
export interface MethodGroup {
  id: string;
  title: string;
  intro: string;
  methods: MethodDescriptor[];
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/**
 * A constant's value as the methods page prints it, exactly (the shortest decimal that reads back
 * as the same double): `5.6696·10⁻⁸`, `0.00873`, `1367`, `−0.56` (true minus sign).
 * {@link parseMethodNumber} reads it back.
 */
export function formatMethodNumber(x: number): string {
  const a = Math.abs(x);
  let s: string;
  if (a !== 0 && (a < 1e-4 || a >= 1e6)) {
    const [m, e] = x.toExponential().split('e');
    const exp = String(Number(e)).replace(/./g, (ch) => SUPERSCRIPT[ch] ?? ch);
    s = `${m}·10${exp}`;
  } else s = String(x);
  return s.replace(/^-/, '\u2212');
}

/** Reads back a number printed by {@link formatMethodNumber}. */
export function parseMethodNumber(s: string): number {
  const normal: Record<string, string> = Object.fromEntries(Object.entries(SUPERSCRIPT).map(([k, v]) => [v, k]));
  const t = s.trim().replace(/\u2212/g, '-');
  const m = t.match(/^(-?[0-9.]+)·10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)$/);
  if (m) return Number(`${m[1]}e${[...m[2]].map((ch) => normal[ch]).join('')}`);
  return Number(t);
}

/**
 * Builds an equation line: constants put in `${…}` print as their value (formatMethodNumber), so
 * the numbers in an equation are the listed constants themselves.
 */
export function eq(strings: TemplateStringsArray, ...parts: Array<MethodConstant | string>): string {
  let out = strings[0];
  parts.forEach((p, i) => {
    out += (typeof p === 'string' ? p : formatMethodNumber(p.value)) + strings[i + 1];
  });
  return out;
}
