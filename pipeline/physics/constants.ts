/**
 * Every constant of the physics stage, with symbol, value, unit and source, in one table the
 * site's methods page renders. The named exports below are the values the code uses; the table
 * {@link PHYSICS_CONSTANTS} is built from the same numbers, so the page cannot drift from the code.
 */

/** Where a constant comes from: key → citation. */
export const PHYSICS_SOURCES = {
  liljegren2008: 'Liljegren et al. 2008, J. Occup. Environ. Hyg. 5(10):645–655; reference code v1.1 (docs/methods.md §6.2)',
  buck1981: 'Buck 1981, J. Appl. Meteor. 20:1527–1532, as used by Liljegren et al. 2008 (docs/methods.md §3.1)',
  buck1996: 'Buck 1996 revision of Buck 1981 (docs/methods.md §3.1)',
  hylandWexler1983: 'Hyland & Wexler 1983, ASHRAE Fundamentals ch. 1 eq. 6 (docs/methods.md §3.1)',
  michalsky1988: 'Michalsky 1988, Solar Energy 40:227–235 (Astronomical Almanac low-precision sun, refraction)',
  epa2000: 'EPA-454/R-99-005 (2000) Meteorological Monitoring Guidance, §6.2.5 power law (docs/methods.md §5)',
  iso7243: 'ISO 7243 WBGT weighting (docs/methods.md §6.1)',
  bom: 'Australian Bureau of Meteorology simplified WBGT (docs/methods.md §7.3)',
  bernard1999: 'Bernard & Pourmoghani 1999; Lemke & Kjellstrom 2012 (docs/methods.md §7.2)',
  stull2011: 'Stull 2011, J. Appl. Meteor. Climatol. 50:2267–2269 (docs/methods.md §7.1)',
  lemke2012: 'Lemke & Kjellstrom 2012, Industrial Health 50:267–278 (indoor WBGT, globe at air temperature)',
  deltaChange: 'the delta change method for what-if climates (pipeline/physics/delta-change.ts); the bound is ours',
} as const;

export type PhysicsSourceKey = keyof typeof PHYSICS_SOURCES;

/** One row of the constants table. */
export interface PhysicsConstant {
  name: string;
  symbol: string;
  value: number;
  unit: string;
  source: PhysicsSourceKey;
}

/** Stefan–Boltzmann constant as coded in the reference [W m⁻² K⁻⁴]. */
export const STEFAN_BOLTZMANN = 5.6696e-8;
/** Specific heat of dry air [J kg⁻¹ K⁻¹]. */
export const CP_AIR = 1003.5;
/** Molar mass of dry air [kg kmol⁻¹]. */
export const M_AIR = 28.97;
/** Molar mass of water [kg kmol⁻¹]. */
export const M_H2O = 18.015;
/** Universal gas constant [J kmol⁻¹ K⁻¹]. */
export const R_GAS = 8314.34;
/** Gas constant of dry air R/M_a [J kg⁻¹ K⁻¹]. */
export const R_AIR = R_GAS / M_AIR;
/** Prandtl number c_p/(c_p + 1.25 R_air) [–]. */
export const PRANDTL = CP_AIR / (CP_AIR + 1.25 * R_AIR);
/** c_p·M_a/M_w [J kg⁻¹ K⁻¹]. */
export const RATIO = (CP_AIR * M_AIR) / M_H2O;
/** Solar constant [W m⁻²]. */
export const SOLAR_CONSTANT = 1367;
/** Wick emissivity [–]. */
export const EMIS_WICK = 0.95;
/** Wick albedo [–]. */
export const ALB_WICK = 0.4;
/** Wick diameter [m]. */
export const D_WICK = 0.007;
/** Wick length [m]. */
export const L_WICK = 0.0254;
/** Globe emissivity [–]. */
export const EMIS_GLOBE = 0.95;
/** Globe albedo [–]. */
export const ALB_GLOBE = 0.05;
/**
 * Globe diameter of the reference implementation [m] (2 in). The property tables are built for it;
 * the diameter in use is a physics setting (`physics.globeDiameter`, default
 * {@link D_GLOBE_STANDARD}), and the reference-table checks run at this one.
 */
export const D_GLOBE = 0.0508;
/**
 * Diameter of the standard black globe the WBGT screening limits are defined with [m]: 150 mm
 * (6 in) (Parsons 2006, Industrial Health 44:368–379, describing ISO 7243; OSHA Technical Manual
 * Section III Chapter 4, the WBGT instrument: a 15 cm (6-inch) hollow copper sphere painted matte
 * black). The default of `physics.globeDiameter`.
 */
export const D_GLOBE_STANDARD = 0.15;
/**
 * Emissivity of a shelter (roof, canopy) seen by the globe and the wick in the sheltered exposure
 * [–]: a black enclosure at the air temperature, the surroundings that the indoor/shaded WBGT
 * methods assume (no radiant heat source, globe at about the air temperature: Lemke & Kjellstrom
 * 2012, Industrial Health 50:267–278, indoor WBGT after Bernard et al.). 1 is our choice of the
 * simplest such enclosure.
 */
export const EMIS_SHELTER = 1;
/** Ground emissivity [–]. */
export const EMIS_SFC = 0.999;
/** Ground albedo [–]. */
export const ALB_SFC = 0.45;
/** Cosine of zenith below which the sun counts as down (cos 89.5°) [–]. */
export const CZA_MIN = 0.00873;
/** Cap on solar / top-of-atmosphere solar [–]. */
export const NORMSOLAR_MAX = 0.85;
/** Largest direct-beam fraction from the empirical estimate [–]. */
export const FDIR_MAX = 0.9;
/** Reference height of the 2 m wind [m]. */
export const REF_HEIGHT = 2.0;
/** Minimum wind speed used in the heat-transfer coefficients [m s⁻¹]. */
export const MIN_SPEED = 0.13;
/** Exponent on Pr/Sc in the wick's mass-transfer analogy [–]. */
export const WICK_EXPONENT = 0.56;
/**
 * Buck (1981) saturation vapour pressure over water, `e_s = a·exp(b·T/(T + c))` with T [°C]:
 * a [hPa], b [–], c [°C] (Buck 1981 eq. 3, as the Liljegren et al. 2008 reference code uses it).
 * The one table of these coefficients: humidity, the property tables, the solver's derivatives
 * and the demo weather read them from here.
 */
export const BUCK_1981 = { a: 6.1121, b: 17.502, c: 240.97 } as const;
/** Moist-air factor applied to Buck 1981 in the model [–]. */
export const MOIST_AIR_FACTOR = 1.004;
/** Kelvin offset [K]. */
export const KELVIN = 273.15;
/**
 * Ratio of the molar masses of water and dry air, M_w/M_a [–] (≈ 0.622): specific humidity
 * q = ε·e/(p − (1 − ε)·e) (common practice, no source), from the model's molar masses.
 */
export const EPSILON_WATER_AIR = M_H2O / M_AIR;
/**
 * Lowest relative humidity a scenario's humidity change may leave [–] (1 %): a change that would
 * take it lower is clamped here and counted (ours; the dew point of 0 % is −∞).
 */
export const SCENARIO_RH_FLOOR = 0.01;
/** Lennard-Jones collision diameter of air [Å] and well depth ε/κ [K] (viscosity). */
export const SIGMA_LJ_AIR = 3.617;
export const EPS_K_AIR = 97;
/** Power-law exponents of the 2 m wind by stability class A…F, urban and rural [–]. */
export const WIND_EXPONENT_URBAN = [0.15, 0.15, 0.2, 0.25, 0.3, 0.3] as const;
export const WIND_EXPONENT_RURAL = [0.07, 0.07, 0.1, 0.15, 0.35, 0.55] as const;

/**
 * WBGT weights outdoors (in the sun; the shade WBGT uses the same weights) [–]:
 * `WBGT = 0.7·Tnw + 0.2·Tg + 0.1·Ta` (ISO 7243, docs/methods.md §6.1). The kernel writes the same
 * numbers inline in its hot loop; test/physics/methods.test.ts pins its output to these.
 */
export const WBGT_WEIGHT_WET_BULB = 0.7;
export const WBGT_WEIGHT_GLOBE = 0.2;
export const WBGT_WEIGHT_AIR = 0.1;

/** The table the methods page shows. */
export const PHYSICS_CONSTANTS: readonly PhysicsConstant[] = [
  { name: 'Stefan–Boltzmann constant (as coded)', symbol: 'σ', value: STEFAN_BOLTZMANN, unit: 'W m⁻² K⁻⁴', source: 'liljegren2008' },
  { name: 'specific heat of dry air', symbol: 'c_p', value: CP_AIR, unit: 'J kg⁻¹ K⁻¹', source: 'liljegren2008' },
  { name: 'molar mass of dry air', symbol: 'M_a', value: M_AIR, unit: 'kg kmol⁻¹', source: 'liljegren2008' },
  { name: 'molar mass of water', symbol: 'M_w', value: M_H2O, unit: 'kg kmol⁻¹', source: 'liljegren2008' },
  { name: 'universal gas constant', symbol: 'R', value: R_GAS, unit: 'J kmol⁻¹ K⁻¹', source: 'liljegren2008' },
  { name: 'gas constant of dry air', symbol: 'R_air', value: R_AIR, unit: 'J kg⁻¹ K⁻¹', source: 'liljegren2008' },
  { name: 'Prandtl number of air', symbol: 'Pr', value: PRANDTL, unit: '–', source: 'liljegren2008' },
  { name: 'c_p·M_a/M_w', symbol: 'RATIO', value: RATIO, unit: 'J kg⁻¹ K⁻¹', source: 'liljegren2008' },
  { name: 'solar constant', symbol: 'S0', value: SOLAR_CONSTANT, unit: 'W m⁻²', source: 'liljegren2008' },
  { name: 'wick emissivity', symbol: 'ε_w', value: EMIS_WICK, unit: '–', source: 'liljegren2008' },
  { name: 'wick albedo', symbol: 'α_w', value: ALB_WICK, unit: '–', source: 'liljegren2008' },
  { name: 'wick diameter', symbol: 'D_w', value: D_WICK, unit: 'm', source: 'liljegren2008' },
  { name: 'wick length', symbol: 'L_w', value: L_WICK, unit: 'm', source: 'liljegren2008' },
  { name: 'globe emissivity', symbol: 'ε_g', value: EMIS_GLOBE, unit: '–', source: 'liljegren2008' },
  { name: 'globe albedo', symbol: 'α_g', value: ALB_GLOBE, unit: '–', source: 'liljegren2008' },
  { name: 'globe diameter of the reference implementation (2 in)', symbol: 'D_g,ref', value: D_GLOBE, unit: 'm', source: 'liljegren2008' },
  { name: 'standard black globe diameter (default)', symbol: 'D_g,std', value: D_GLOBE_STANDARD, unit: 'm', source: 'iso7243' },
  { name: 'emissivity of a shelter at air temperature', symbol: 'ε_shelter', value: EMIS_SHELTER, unit: '–', source: 'lemke2012' },
  { name: 'ground emissivity', symbol: 'ε_sfc', value: EMIS_SFC, unit: '–', source: 'liljegren2008' },
  { name: 'ground albedo', symbol: 'α_sfc', value: ALB_SFC, unit: '–', source: 'liljegren2008' },
  { name: 'sun-down threshold cos(89.5°)', symbol: 'CZA_MIN', value: CZA_MIN, unit: '–', source: 'liljegren2008' },
  { name: 'cap on solar / top-of-atmosphere solar', symbol: 'NORMSOLAR_MAX', value: NORMSOLAR_MAX, unit: '–', source: 'liljegren2008' },
  { name: 'largest estimated direct fraction', symbol: 'f_dir,max', value: FDIR_MAX, unit: '–', source: 'liljegren2008' },
  { name: 'reference wind height', symbol: 'z_ref', value: REF_HEIGHT, unit: 'm', source: 'liljegren2008' },
  { name: 'minimum wind speed', symbol: 'u_min', value: MIN_SPEED, unit: 'm s⁻¹', source: 'liljegren2008' },
  { name: 'wick mass-transfer exponent', symbol: 'a', value: WICK_EXPONENT, unit: '–', source: 'liljegren2008' },
  { name: 'moist-air factor on Buck 1981', symbol: 'f_w', value: MOIST_AIR_FACTOR, unit: '–', source: 'buck1981' },
  { name: 'ratio of the molar masses of water and dry air', symbol: 'ε', value: EPSILON_WATER_AIR, unit: '–', source: 'liljegren2008' },
  { name: 'lowest relative humidity a scenario leaves', symbol: 'RH_min', value: SCENARIO_RH_FLOOR, unit: '–', source: 'deltaChange' },
  { name: 'Lennard-Jones diameter of air', symbol: 'σ_LJ', value: SIGMA_LJ_AIR, unit: 'Å', source: 'liljegren2008' },
  { name: 'Lennard-Jones well depth of air', symbol: 'ε/κ', value: EPS_K_AIR, unit: 'K', source: 'liljegren2008' },
  ...WIND_EXPONENT_URBAN.map((v, i) => ({
    name: `wind power-law exponent, urban, class ${'ABCDEF'[i]}`,
    symbol: `p_u,${i + 1}`,
    value: v,
    unit: '–',
    source: 'epa2000' as const,
  })),
  ...WIND_EXPONENT_RURAL.map((v, i) => ({
    name: `wind power-law exponent, rural, class ${'ABCDEF'[i]}`,
    symbol: `p_r,${i + 1}`,
    value: v,
    unit: '–',
    source: 'epa2000' as const,
  })),
  { name: 'WBGT weight of natural wet bulb (sun)', symbol: 'w_nw', value: WBGT_WEIGHT_WET_BULB, unit: '–', source: 'iso7243' },
  { name: 'WBGT weight of globe temperature (sun)', symbol: 'w_g', value: WBGT_WEIGHT_GLOBE, unit: '–', source: 'iso7243' },
  { name: 'WBGT weight of air temperature (sun)', symbol: 'w_a', value: WBGT_WEIGHT_AIR, unit: '–', source: 'iso7243' },
];
