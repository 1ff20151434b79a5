/**
 * The bibliography of the pipeline: every published source a formula, constant, rule or caution
 * of heathours rests on, with a stable id, and the shape of the method descriptors that cite them
 * (pipeline/physics/methods.ts, pipeline/work/methods.ts, pipeline/climate/methods.ts,
 * pipeline/regions/methods.ts). The site's methods page renders both, so the page shows what the
 * code uses.
 *
 * Details are as METHODS.md gives them; `checked` says what of an entry was read in the source
 * (METHODS.md's [V] tag) and what is from memory, exactly as METHODS.md marks it. Pure data, no
 * imports: the browser calculator may import the work stage, which imports this file.
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
  'epa2000',
  'iso7243-2017',
  'iso7243-1989',
  'iso8996',
  'niosh2016',
  'acgih-tlv',
  'bernard2008',
  'kjellstrom2018',
  'dunne2013',
  'hyndman1996',
  'wmo1203',
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
    checked: 'Equations and constants read in the v1.1 reference C code (METHODS.md §3.2); author list from memory.',
  },
  {
    id: 'buck1981',
    cite: 'Buck 1981',
    authors: 'Buck, A. L.',
    year: 1981,
    title: 'New equations for computing vapor pressure and enhancement factor',
    publication: 'Journal of Applied Meteorology 20:1527–1532',
    checked: 'Coefficients read as used in the Liljegren reference code (esat(), "Buck\'s (1981) approximation (eqn 3)"); checked against the CRC Handbook vapour-pressure table (METHODS.md §1.3).',
  },
  {
    id: 'bsl1960',
    cite: 'Bird, Stewart & Lightfoot 1960',
    authors: 'Bird, R. B., Stewart, W. E. and Lightfoot, E. N.',
    year: 1960,
    title: 'Transport Phenomena',
    publication: 'Wiley, New York (viscosity of gases, heat transfer from a sphere, p. 409)',
    checked: 'Formulas as coded in the Liljegren reference code (METHODS.md §3.2.2–§3.2.3); the book itself was not read.',
  },
  {
    id: 'bedingfield1950',
    cite: 'Bedingfield & Drew 1950',
    authors: 'Bedingfield, C. H. and Drew, T. B.',
    year: 1950,
    title: 'Analogy between heat transfer and mass transfer: a psychrometric study',
    publication: 'Industrial and Engineering Chemistry 42:1164–1173',
    checked: 'Cylinder heat-transfer correlation as coded in the Liljegren reference code (METHODS.md §3.2.3); title, journal and pages from memory.',
  },
  {
    id: 'oke1987',
    cite: 'Oke 1987',
    authors: 'Oke, T. R.',
    year: 1987,
    title: 'Boundary Layer Climates (2nd edition)',
    publication: 'Methuen, London',
    checked: 'Atmospheric emissivity formula as coded in the Liljegren reference code (METHODS.md §3.2.2); edition and year from memory.',
  },
  {
    id: 'michalsky1988',
    cite: 'Michalsky 1988',
    authors: 'Michalsky, J. J.',
    year: 1988,
    title: "The Astronomical Almanac's algorithm for approximate solar position (1950–2050)",
    publication: 'Solar Energy 40(3):227–235',
    checked: 'Formulas as used in the Liljegren reference code (METHODS.md §3.2.6); checked against the NOAA solar position formulas (METHODS.md §4.1).',
  },
  {
    id: 'epa2000',
    cite: 'US EPA 2000',
    authors: 'U.S. Environmental Protection Agency',
    year: 2000,
    title: 'Meteorological Monitoring Guidance for Regulatory Modeling Applications',
    publication: 'EPA-454/R-99-005, §6.2.5 (wind power law by stability class)',
    checked: 'Exponents and the stability-class table as coded in the Liljegren reference code (METHODS.md §3.2.7).',
  },
  {
    id: 'iso7243-2017',
    cite: 'ISO 7243:2017',
    authors: 'International Organization for Standardization',
    year: 2017,
    title: 'Ergonomics of the thermal environment — Assessment of heat stress using the WBGT (wet bulb globe temperature) index',
    publication: 'ISO 7243:2017',
    checked: 'Scope read in the catalogue abstract; the WBGT weighting and the limit curves are known from secondary sources (METHODS.md §3.1, §5.2); the standard\'s text was not read.',
  },
  {
    id: 'iso7243-1989',
    cite: 'ISO 7243:1989',
    authors: 'International Organization for Standardization',
    year: 1989,
    title: 'Hot environments — Estimation of the heat stress on working man, based on the WBGT-index (wet bulb globe temperature)',
    publication: 'ISO 7243:1989',
    checked: 'Reference values read in the standard\'s table as reproduced in an instrument manual (METHODS.md §5.2).',
  },
  {
    id: 'iso8996',
    cite: 'ISO 8996',
    authors: 'International Organization for Standardization',
    year: 2004,
    title: 'Ergonomics of the thermal environment — Determination of metabolic rate',
    publication: 'ISO 8996',
    checked: 'Class boundaries read (via the ISO 7243:1989 table); typical values and task examples from memory (METHODS.md §5.1); year of the edition from memory.',
  },
  {
    id: 'niosh2016',
    cite: 'NIOSH 2016',
    authors: 'Jacklitsch, B. et al. (National Institute for Occupational Safety and Health)',
    year: 2016,
    title: 'Criteria for a Recommended Standard: Occupational Exposure to Heat and Hot Environments',
    publication: 'DHHS (NIOSH) Publication No. 2016-106',
    checked: 'REL and RAL curves read in public code and secondary code comments citing §8.1; the criteria document itself was not read (METHODS.md §5.3).',
  },
  {
    id: 'acgih-tlv',
    cite: 'ACGIH TLV',
    authors: 'American Conference of Governmental Industrial Hygienists',
    year: null,
    title: 'Heat Stress and Strain: TLV® documentation (clothing adjustment values)',
    publication: 'ACGIH, Cincinnati',
    checked: 'List of ensembles read in a reproduction; most values from memory, as marked per value (METHODS.md §5.5).',
  },
  {
    id: 'bernard2008',
    cite: 'Bernard et al. 2008',
    authors: 'Bernard, T. E. et al.',
    year: 2008,
    title: 'Clothing adjustment factors for heat stress evaluation',
    publication: 'Journal of Occupational and Environmental Hygiene (2008)',
    checked: 'Measured values read in the abstract (METHODS.md §5.5); title from memory.',
  },
  {
    id: 'kjellstrom2018',
    cite: 'Kjellstrom et al. 2018',
    authors: 'Kjellstrom, T. et al.',
    year: 2018,
    title: 'Estimating population heat exposure and impacts on working people in conjunction with climate change',
    publication: 'International Journal of Biometeorology 62:291–306',
    doi: '10.1007/s00484-017-1407-0',
    checked: 'μ and σ read in two independent public research codes; the paper itself was not read; volume, pages and title from memory (METHODS.md §6.1).',
  },
  {
    id: 'dunne2013',
    cite: 'Dunne et al. 2013',
    authors: 'Dunne, J. P., Stouffer, R. J. and John, J. G.',
    year: 2013,
    title: 'Reductions in labour capacity from heat stress under climate warming',
    publication: 'Nature Climate Change 3:563–566',
    checked: 'Formula read in a public library\'s source and docstring (METHODS.md §6.3); title from memory.',
  },
  {
    id: 'hyndman1996',
    cite: 'Hyndman & Fan 1996',
    authors: 'Hyndman, R. J. and Fan, Y.',
    year: 1996,
    title: 'Sample quantiles in statistical packages',
    publication: 'The American Statistician 50(4):361–365',
    checked: 'Type 7 as the default of R and numpy (METHODS.md §8); journal details from memory.',
  },
  {
    id: 'wmo1203',
    cite: 'WMO-No. 1203',
    authors: 'World Meteorological Organization',
    year: 2017,
    title: 'WMO Guidelines on the Calculation of Climate Normals',
    publication: 'WMO-No. 1203',
    checked: 'Title read; the completeness rules used here (≤ 10 missing days a month, ≥ 80 % of years) are from memory (METHODS.md §8).',
  },
  {
    id: 'xu2020',
    cite: 'Xu et al. 2020',
    authors: 'Xu, C., Kohler, T. A., Lenton, T. M., Svenning, J.-C. and Scheffer, M.',
    year: 2020,
    title: 'Future of the human climate niche',
    publication: 'Proceedings of the National Academy of Sciences 117:11350–11355',
    doi: '10.1073/pnas.1910114117',
    checked: 'Modes and the 29 °C statement read in the abstract; volume, pages and DOI from memory (METHODS.md §7).',
  },
  {
    id: 'lenton2023',
    cite: 'Lenton et al. 2023',
    authors: 'Lenton, T. M. et al.',
    year: 2023,
    title: 'Quantifying the human cost of global warming',
    publication: 'Nature Sustainability 6:1237–1247',
    doi: '10.1038/s41893-023-01132-6',
    checked: 'The 29 °C threshold and the 20-year averaging read in the abstract and figure caption (METHODS.md §7).',
  },
  {
    id: 'ecmwf-era5',
    cite: 'ECMWF ERA5 documentation',
    authors: 'European Centre for Medium-Range Weather Forecasts',
    year: null,
    title: 'ERA5 and ERA5-Land data documentation (accumulations, grids, parameters)',
    publication: 'ECMWF Confluence pages',
    checked: 'Accumulation conventions, units and grids read in the documentation (METHODS.md §4.4).',
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
