/**
 * The physics stage's formulas as the methods page shows them: equation, symbols, constants and
 * sources (pipeline/model/sources.ts). Exported constants are imported, never copied. Numbers the
 * code writes inside a function are listed with that function as `code`, and
 * test/physics/methods.test.ts evaluates each such method with the listed values against the
 * function; equations print the listed constants themselves (`eq`), so the page cannot drift
 * from the code.
 */
import { eq, type MethodConstant, type MethodGroup } from '../model/sources.ts';
import {
  ALB_GLOBE,
  ALB_SFC,
  ALB_WICK,
  BUCK_1981,
  CP_AIR,
  EPSILON_WATER_AIR,
  SCENARIO_RH_FLOOR,
  CZA_MIN,
  D_GLOBE,
  D_GLOBE_STANDARD,
  EMIS_SHELTER,
  D_WICK,
  EMIS_GLOBE,
  EMIS_SFC,
  EMIS_WICK,
  EPS_K_AIR,
  FDIR_MAX,
  KELVIN,
  L_WICK,
  MIN_SPEED,
  MOIST_AIR_FACTOR,
  M_AIR,
  M_H2O,
  NORMSOLAR_MAX,
  PRANDTL,
  RATIO,
  REF_HEIGHT,
  R_AIR,
  R_GAS,
  SIGMA_LJ_AIR,
  SOLAR_CONSTANT,
  STEFAN_BOLTZMANN,
  WBGT_WEIGHT_AIR,
  WBGT_WEIGHT_GLOBE,
  WBGT_WEIGHT_WET_BULB,
  WICK_EXPONENT,
  WIND_EXPONENT_RURAL,
  WIND_EXPONENT_URBAN,
} from './constants.ts';
import { GLOBE_DIAMETER_RANGE, MAX_ITERATIONS, ROOT_TOLERANCE_K } from './liljegren-solve.ts';
import { SOLAR_FIRST_YEAR, SOLAR_LAST_YEAR } from './solar-position.ts';

const C = 'pipeline/physics/constants.ts';
const VISC = 'pipeline/physics/air-properties.ts airViscosity()';
const COND = 'pipeline/physics/air-properties.ts airThermalConductivity()';
const DIFF = 'pipeline/physics/air-properties.ts vaporDiffusivity()';
const LAT = 'pipeline/physics/air-properties.ts latentHeat()';
const EMIS = 'pipeline/physics/air-properties.ts atmosphericEmissivity()';
const SPH = 'pipeline/physics/air-properties.ts sphereHeatTransfer()';
const CYL = 'pipeline/physics/air-properties.ts cylinderHeatTransfer()';
const SUN = 'pipeline/physics/solar-position.ts sunState()';
const REFR = 'pipeline/physics/solar-position.ts refractionDeg()';
const FDIR = 'pipeline/physics/solar-inputs.ts directFractionExact()';

/** A constant exported by constants.ts. */
function exported(symbol: string, name: string, value: number, unit: string, exportName: string, derived?: string): MethodConstant {
  return { symbol, name, value, unit, code: `${C}#${exportName}`, ...(derived ? { derived } : {}) };
}

/** A number written inside `code` (a function). */
function literal(symbol: string, name: string, value: number, unit: string, code: string): MethodConstant {
  return { symbol, name, value, unit, code };
}

// Shared constants.
const EPS_WA = exported('ε', 'ratio of the molar masses of water and dry air, M_w/M_a', EPSILON_WATER_AIR, '–', 'EPSILON_WATER_AIR', 'M_w/M_a');
const RH_MIN = exported('RH_min', 'lowest relative humidity a scenario leaves (clamped and counted)', SCENARIO_RH_FLOOR, '–', 'SCENARIO_RH_FLOOR');
const SIGMA = exported('σ', 'Stefan–Boltzmann constant (as coded in the reference)', STEFAN_BOLTZMANN, 'W m⁻² K⁻⁴', 'STEFAN_BOLTZMANN');
const EPS_SFC = exported('ε_sfc', 'ground emissivity', EMIS_SFC, '–', 'EMIS_SFC');
const A_SFC = exported('α_sfc', 'ground albedo', ALB_SFC, '–', 'ALB_SFC');
const U_MIN = exported('u_min', 'lowest wind speed used', MIN_SPEED, 'm s⁻¹', 'MIN_SPEED');
const CZA = exported('CZA_min', 'cosine of zenith below which the sun counts as down, cos 89.5°', CZA_MIN, '–', 'CZA_MIN');
const D_W = exported('D_w', 'wick diameter', D_WICK, 'm', 'D_WICK');
const TOL: MethodConstant = {
  symbol: 'δ',
  name: 'Newton step below which a solve stops',
  value: ROOT_TOLERANCE_K,
  unit: 'K',
  code: 'pipeline/physics/liljegren-solve.ts#ROOT_TOLERANCE_K',
};
const ITER: MethodConstant = {
  symbol: 'n_max',
  name: 'most iterations per solve (then no value, counted)',
  value: MAX_ITERATIONS,
  unit: '–',
  code: 'pipeline/physics/liljegren-solve.ts#MAX_ITERATIONS',
};

// Saturation vapour pressure (Buck 1981 × moist-air factor).
const ES_A = exported('a', 'Buck 1981 prefactor', BUCK_1981.a, 'hPa', 'BUCK_1981.a');
const ES_B = exported('b', 'Buck 1981 coefficient', BUCK_1981.b, '–', 'BUCK_1981.b');
const ES_C = exported('c', 'Buck 1981 coefficient', BUCK_1981.c, '°C', 'BUCK_1981.c');
const ES_F = exported('f_w', 'moist-air factor (the reference code\u2019s constant where pressure is not used)', MOIST_AIR_FACTOR, '–', 'MOIST_AIR_FACTOR');

// Properties of air.
const MU0 = literal('μ₀', 'viscosity prefactor (gives μ in kg m⁻¹ s⁻¹ with T in K, M_a in kg kmol⁻¹ and σ_LJ in Å)', 2.6693e-6, '–', VISC);
const OM0 = literal('Ω₀', 'collision-integral intercept', 1.048, '–', VISC);
const OM1 = literal('Ω₁', 'collision-integral slope', 0.034, '–', VISC);
const OM2 = literal('Ω₂', 'collision-integral offset', 2.9, '–', VISC);
const OM3 = literal('Ω₃', 'collision-integral divisor', 0.4, '–', VISC);
const K125 = literal('k₁', 'factor on R_air in the conductivity (Eucken form, as coded)', 1.25, '–', COND);
const DV0 = literal('D₀', 'diffusivity prefactor', 3.64e-4, '–', DIFF);
const DV1 = literal('n_D', 'diffusivity temperature exponent', 2.334, '–', DIFF);
const TC_A = literal('T_c,a', 'critical temperature of air', 132, 'K', DIFF);
const TC_W = literal('T_c,w', 'critical temperature of water', 647.3, 'K', DIFF);
const PC_A = literal('P_c,a', 'critical pressure of air', 36.4, 'atm', DIFF);
const PC_W = literal('P_c,w', 'critical pressure of water', 218, 'atm', DIFF);
const P0 = literal('P₀', 'standard pressure', 1013.25, 'hPa', DIFF);
const LH0 = literal('ΔH₀', 'latent heat at 313.15 K', 2.4073e6, 'J kg⁻¹', LAT);
const LH1 = literal('ΔH₁', 'change of latent heat per 30 K', 71100, 'J kg⁻¹', LAT);
const LH2 = literal('T_ΔH', 'reference temperature of the latent heat', 313.15, 'K', LAT);

// Sky emissivity.
const EA0 = literal('a_ε', 'emissivity prefactor', 0.575, '–', EMIS);
const EA1 = literal('b_ε', 'emissivity exponent', 0.143, '–', EMIS);

// Convective heat transfer.
const SPH_A = literal('a_s', 'sphere: coefficient of the Reynolds term', 0.6, '–', SPH);
const SPH_N = literal('n_s', 'sphere: Prandtl exponent', 0.3333, '–', SPH);
const CYL_A = literal('a_c', 'cylinder: coefficient', 0.281, '–', CYL);
const CYL_M = literal('m_c', 'cylinder: Reynolds exponent', 0.6, '–', CYL);
const CYL_N = literal('n_c', 'cylinder: Prandtl exponent', 0.44, '–', CYL);

// WBGT weights.
const W_NW = exported('w_nw', 'weight of the natural wet bulb', WBGT_WEIGHT_WET_BULB, '–', 'WBGT_WEIGHT_WET_BULB');
const W_G = exported('w_g', 'weight of the globe temperature', WBGT_WEIGHT_GLOBE, '–', 'WBGT_WEIGHT_GLOBE');
const W_A = exported('w_a', 'weight of the air temperature', WBGT_WEIGHT_AIR, '–', 'WBGT_WEIGHT_AIR');

// Sun position (Meeus 1998 low-accuracy solar coordinates, as NOAA's solar calculator uses them).
const JD0 = literal('JD₀', 'Julian date of J2000.0', 2451545.0, 'd', SUN);
const JC = literal('N_c', 'days per Julian century', 36525, 'd', SUN);
const L0 = literal('L₀,₀', 'mean longitude at J2000.0', 280.46646, '°', SUN);
const L1 = literal('L₀,₁', 'mean longitude, T term', 36000.76983, '°', SUN);
const L2 = literal('L₀,₂', 'mean longitude, T² term', 0.0003032, '°', SUN);
const M0 = literal('M₀', 'mean anomaly at J2000.0', 357.52911, '°', SUN);
const M1 = literal('M₁', 'mean anomaly, T term', 35999.05029, '°', SUN);
const M2 = literal('M₂', 'mean anomaly, T² term', 0.0001537, '°', SUN);
const E0 = literal('e₀', 'eccentricity at J2000.0', 0.016708634, '–', SUN);
const E1 = literal('e₁', 'eccentricity, T term', 0.000042037, '–', SUN);
const E2 = literal('e₂', 'eccentricity, T² term', 0.0000001267, '–', SUN);
const C10 = literal('C₁,₀', 'equation of the centre, sin M', 1.914602, '°', SUN);
const C11 = literal('C₁,₁', 'equation of the centre, T·sin M', 0.004817, '°', SUN);
const C12 = literal('C₁,₂', 'equation of the centre, T²·sin M', 0.000014, '°', SUN);
const C20 = literal('C₂,₀', 'equation of the centre, sin 2M', 0.019993, '°', SUN);
const C21 = literal('C₂,₁', 'equation of the centre, T·sin 2M', 0.000101, '°', SUN);
const C3 = literal('C₃', 'equation of the centre, sin 3M', 0.000289, '°', SUN);
const RA = literal('a_R', 'semi-major axis factor of the distance', 1.000001018, 'AU', SUN);
const ND0 = literal('Ω₀', 'longitude of the Moon\u2019s ascending node at J2000.0', 125.04, '°', SUN);
const ND1 = literal('Ω₁', 'node, T term', 1934.136, '°', SUN);
const AB = literal('κ', 'aberration', 0.00569, '°', SUN);
const NU = literal('ψ₁', 'nutation in longitude, main term', 0.00478, '°', SUN);
const EP0 = literal('ε₀,₀', 'obliquity at J2000.0 (23°26′21.448″)', 23 + 26 / 60 + 21.448 / 3600, '°', SUN);
const EP1 = literal('ε₀,₁', 'obliquity, T term', 46.815, '″', SUN);
const EP2 = literal('ε₀,₂', 'obliquity, T² term', 0.00059, '″', SUN);
const EP3 = literal('ε₀,₃', 'obliquity, T³ term', 0.001813, '″', SUN);
const EPN = literal('ε₁', 'nutation in obliquity, main term', 0.00256, '°', SUN);
const TH0 = literal('θ₀,₀', 'mean sidereal time at J2000.0', 280.46061837, '°', SUN);
const TH1 = literal('θ₀,₁', 'sidereal rate', 360.98564736629, '° d⁻¹', SUN);
const TH2 = literal('θ₀,₂', 'sidereal time, T² term', 0.000387933, '°', SUN);
const TH3 = literal('θ₀,₃', 'sidereal time, T³ divisor', 38710000, '–', SUN);

// Refraction.
const R0 = literal('r₀', 'overall factor', 3.51561, '°', REFR);
const R1 = literal('r₁', 'numerator constant', 0.1594, '–', REFR);
const R2 = literal('r₂', 'numerator, e term', 0.0196, '°⁻¹', REFR);
const R3 = literal('r₃', 'numerator, e² term', 0.00002, '°⁻²', REFR);
const R4 = literal('r₄', 'denominator, e term', 0.505, '°⁻¹', REFR);
const R5 = literal('r₅', 'denominator, e² term', 0.0845, '°⁻²', REFR);
const R6 = literal('e_min', 'lowest elevation corrected', -0.56, '°', REFR);

// Solar load and the direct share.
const S0 = exported('S₀', 'solar constant', SOLAR_CONSTANT, 'W m⁻²', 'SOLAR_CONSTANT');
const SMAX = exported('s_max', 'cap on solar / top-of-atmosphere solar', NORMSOLAR_MAX, '–', 'NORMSOLAR_MAX');
const FMAX = exported('f_max', 'largest estimated direct share', FDIR_MAX, '–', 'FDIR_MAX');
const K0 = literal('k₀', 'direct-share estimate, constant', 3, '–', FDIR);
const K1 = literal('k₁', 'direct-share estimate, s* term', 1.34, '–', FDIR);
const K2 = literal('k₂', 'direct-share estimate, 1/s* term', 1.65, '–', FDIR);

// Wind.
const ZREF = exported('z_ref', 'height of the instruments', REF_HEIGHT, 'm', 'REF_HEIGHT');

export const PHYSICS_METHODS: MethodGroup = {
  id: 'physics',
  title: 'From weather to WBGT',
  intro:
    'Every land cell and hour: humidity, the position of the sun, the wind at 2 m, then the globe and natural wet-bulb temperatures of the Liljegren et al. (2008) model, solved to the exact root, and the WBGT in the sun and in the shade.',
  methods: [
    {
      id: 'saturation-vapour-pressure',
      name: 'Saturation vapour pressure and the air\u2019s vapour pressure',
      summary: 'Vapour pressure over liquid water at a temperature; the air\u2019s vapour pressure is its value at the dew point.',
      equation: [
        eq`e_s(T) = ${ES_F} · ${ES_A} · exp(${ES_B}·T / (T + ${ES_C}))`,
        'e_a = e_s(T_d),   RH = 100 · e_s(T_d) / e_s(T_a)',
        'T_d is set to T_a where the data give a dew point above the air temperature (the build counts these hours)',
      ],
      symbols: [
        { symbol: 'T', meaning: 'temperature', unit: '°C' },
        { symbol: 'T_a, T_d', meaning: 'air temperature and dew point at 2 m', unit: '°C' },
        { symbol: 'e_s, e_a', meaning: 'saturation and actual vapour pressure', unit: 'hPa' },
        { symbol: 'RH', meaning: 'relative humidity', unit: '%' },
      ],
      constants: [ES_A, ES_B, ES_C, ES_F],
      sources: ['buck1981', 'liljegren2008'],
      code: ['pipeline/physics/humidity.ts saturationVaporPressureModel()', 'pipeline/physics/property-tables.ts (tabulated for the kernel)'],
      notes: ['The moist-air factor cancels in RH; it matters in the wick balance, where e_s enters an absolute balance.'],
    },
    {
      id: 'air-properties',
      name: 'Properties of air',
      summary:
        'Density, viscosity, thermal conductivity, vapour diffusivity and latent heat of the air around the globe and the wick, at the film temperature T (the mean of the surface and air temperatures).',
      equation: [
        'ρ = 100·P / (R_air·T)',
        eq`Ω = ${OM0} − ${OM1}·(T/(ε/κ) − ${OM2})/${OM3},   μ = ${MU0}·√(M_a·T) / (σ_LJ²·Ω)`,
        eq`k = (c_p + ${K125}·R_air)·μ`,
        eq`D_v = ${DV0}·(T/√(${TC_A}·${TC_W}))^${DV1}·(${PC_A}·${PC_W})^(1/3)·(${TC_A}·${TC_W})^(5/12)·√(1/M_a + 1/M_w) / (P/${P0})·10⁻⁴`,
        eq`ΔH = ${LH0} − ${LH1}·(${LH2} − T)/30`,
      ],
      symbols: [
        { symbol: 'T', meaning: 'film temperature', unit: 'K' },
        { symbol: 'P', meaning: 'surface pressure', unit: 'hPa' },
        { symbol: 'ρ', meaning: 'air density', unit: 'kg m⁻³' },
        { symbol: 'μ', meaning: 'dynamic viscosity', unit: 'kg m⁻¹ s⁻¹' },
        { symbol: 'k', meaning: 'thermal conductivity', unit: 'W m⁻¹ K⁻¹' },
        { symbol: 'D_v', meaning: 'diffusivity of water vapour in air', unit: 'm² s⁻¹' },
        { symbol: 'ΔH', meaning: 'latent heat of vaporisation', unit: 'J kg⁻¹' },
      ],
      constants: [
        exported('c_p', 'specific heat of dry air', CP_AIR, 'J kg⁻¹ K⁻¹', 'CP_AIR'),
        exported('M_a', 'molar mass of dry air', M_AIR, 'kg kmol⁻¹', 'M_AIR'),
        exported('M_w', 'molar mass of water', M_H2O, 'kg kmol⁻¹', 'M_H2O'),
        exported('R', 'universal gas constant', R_GAS, 'J kmol⁻¹ K⁻¹', 'R_GAS'),
        exported('R_air', 'gas constant of dry air', R_AIR, 'J kg⁻¹ K⁻¹', 'R_AIR', 'R/M_a'),
        exported('σ_LJ', 'Lennard-Jones collision diameter of air', SIGMA_LJ_AIR, 'Å', 'SIGMA_LJ_AIR'),
        exported('ε/κ', 'Lennard-Jones well depth of air', EPS_K_AIR, 'K', 'EPS_K_AIR'),
        MU0,
        OM0,
        OM1,
        OM2,
        OM3,
        K125,
        DV0,
        DV1,
        TC_A,
        TC_W,
        PC_A,
        PC_W,
        P0,
        LH0,
        LH1,
        LH2,
      ],
      sources: ['bsl1960', 'liljegren2008'],
      code: [
        'pipeline/physics/air-properties.ts airDensity(), airViscosity(), airThermalConductivity(), vaporDiffusivity(), latentHeat()',
        'pipeline/physics/property-tables.ts (tabulated at 0.25 K)',
      ],
    },
    {
      id: 'atmospheric-emissivity',
      name: 'Emissivity of the sky',
      summary: 'The long-wave radiation the globe and the wick receive from the sky, from the air\u2019s vapour pressure.',
      equation: [eq`ε_a = ${EA0} · e_a^${EA1}`, 'long-wave load ½·(ε_a + ε_sfc)·σ·T_a⁴ (the ground is taken at the air temperature)'],
      symbols: [
        { symbol: 'ε_a', meaning: 'emissivity of the atmosphere', unit: '–' },
        { symbol: 'e_a', meaning: 'vapour pressure of the air', unit: 'hPa' },
      ],
      constants: [EA0, EA1, EPS_SFC, SIGMA],
      sources: ['oke1987', 'liljegren2008'],
      code: [`${EMIS}`, 'pipeline/physics/property-tables.ts (with the dew-point table)'],
    },
    {
      id: 'heat-transfer',
      name: 'Convective heat transfer of the globe and the wick',
      summary: 'How fast the air carries heat to or from the black globe (a sphere of the configured diameter) and the wick (a cylinder across the flow).',
      equation: [
        'Re = u·ρ·D/μ   with u = max(u₂, u_min)',
        eq`globe (sphere):   Nu = 2 + ${SPH_A}·√Re·Pr^${SPH_N}`,
        eq`wick (cylinder):   Nu = ${CYL_A}·Re^${CYL_M}·Pr^${CYL_N}`,
        'h = Nu·k/D,   Pr = c_p/(c_p + 1.25·R_air)',
      ],
      symbols: [
        { symbol: 'u₂', meaning: 'wind speed at 2 m', unit: 'm s⁻¹' },
        { symbol: 'D', meaning: 'globe or wick diameter', unit: 'm' },
        { symbol: 'Re, Nu, Pr', meaning: 'Reynolds, Nusselt and Prandtl numbers', unit: '–' },
        { symbol: 'h', meaning: 'heat-transfer coefficient', unit: 'W m⁻² K⁻¹' },
      ],
      constants: [
        U_MIN,
        exported('D_g', 'globe diameter of the reference implementation (2 in), used for the reference-table checks', D_GLOBE, 'm', 'D_GLOBE'),
        exported('D_std', 'diameter of the standard black globe, the default globe (physics.globeDiameter)', D_GLOBE_STANDARD, 'm', 'D_GLOBE_STANDARD'),
        {
          symbol: 'D_min',
          name: 'smallest globe diameter accepted',
          value: GLOBE_DIAMETER_RANGE[0],
          unit: 'm',
          code: 'pipeline/physics/liljegren-solve.ts#GLOBE_DIAMETER_RANGE.0',
        },
        {
          symbol: 'D_max',
          name: 'largest globe diameter accepted',
          value: GLOBE_DIAMETER_RANGE[1],
          unit: 'm',
          code: 'pipeline/physics/liljegren-solve.ts#GLOBE_DIAMETER_RANGE.1',
        },
        D_W,
        exported('Pr', 'Prandtl number of air', PRANDTL, '–', 'PRANDTL', 'c_p/(c_p + 1.25·R_air)'),
        K125,
        SPH_A,
        SPH_N,
        CYL_A,
        CYL_M,
        CYL_N,
      ],
      sources: ['bsl1960', 'bedingfield1950', 'liljegren2008'],
      code: [
        'pipeline/physics/air-properties.ts sphereHeatTransfer(), cylinderHeatTransfer()',
        'pipeline/physics/liljegren-solve.ts globeFactors() (the same, with terms hoisted per cell)',
      ],
      notes: [
        'The globe\u2019s h_g falls with its diameter (the Nu = 2 term as 1/D, the Reynolds term as 1/√D), so a larger globe sheds less of its solar gain to the air and reads warmer in the sun. The code holds h_g for the 2-inch globe and scales it for the configured one: h_g(D) = (D_g/D)·(M(T) + c_g·√(D/D_g)·R(T)).',
      ],
    },
    {
      id: 'globe-temperature',
      name: 'Globe temperature',
      summary: 'The temperature of a black globe in the sun (in the shade: S = 0), the root of its energy balance.',
      equation: [
        'T_g⁴ = ½·(ε_a + ε_sfc)·T_a⁴ − h_g/(ε_g·σ)·(T_g − T_a) + (1 − α_g)/(2·ε_g·σ) · S · [f_dir·(1/(2·cos θ) − 1) + 1 + α_sfc]',
        'h_g at the film temperature (T_g + T_a)/2; below cos θ = CZA_min the beam counts as diffuse (f_dir = 0)',
      ],
      symbols: [
        { symbol: 'T_g, T_a', meaning: 'globe and air temperature (T [K] = T [°C] + K)', unit: 'K' },
        { symbol: 'S', meaning: 'global horizontal solar irradiance, hour mean, after the cap', unit: 'W m⁻²' },
        { symbol: 'f_dir', meaning: 'direct-beam share of S', unit: '–' },
        { symbol: 'θ', meaning: 'solar zenith angle', unit: '°' },
      ],
      constants: [
        SIGMA,
        exported('ε_g', 'globe emissivity', EMIS_GLOBE, '–', 'EMIS_GLOBE'),
        exported('α_g', 'globe albedo', ALB_GLOBE, '–', 'ALB_GLOBE'),
        EPS_SFC,
        A_SFC,
        CZA,
        exported('K', 'kelvin offset', KELVIN, 'K', 'KELVIN'),
        TOL,
        ITER,
      ],
      sources: ['liljegren2008'],
      code: ['pipeline/physics/liljegren-solve.ts solveGlobe(), globeRoot()', 'pipeline/physics/kernel.ts wbgtKernel()'],
      notes: [
        'Solved to the exact root by safeguarded Newton iteration with analytic derivatives; the reference code\u2019s damped loop stops up to 0.0172 °C away from it (largest difference over the 150 rows of the reference table, with its geometry fed in: globe 0.0172 °C, natural wet bulb 0.0153 °C, WBGT 0.0138 °C).',
        'Globe diameter: the screening limits (ISO 7243, NIOSH, ACGIH) are defined for WBGT measured with the standard 150 mm black globe (Parsons 2006 describing ISO 7243; the OSHA Technical Manual\u2019s 15 cm (6-inch) hollow copper sphere). The Liljegren reference implementation models a 2-inch globe, which reads cooler in the sun. The atlas computes the globe the limits assume: physics.globeDiameter = 0.15 m by default (0.0508 m reproduces the reference implementation; its table is checked at that diameter). The effect on the demo is under "Modelling choices and their effect on the demo".',
      ],
    },
    {
      id: 'natural-wet-bulb',
      name: 'Natural wet-bulb temperature',
      summary: 'The temperature of a wet wick exposed to the air and the sun (in the shade: S = 0), not ventilated: the root of its energy and mass balance.',
      equation: [
        'T_w = T_a − (ΔH/RATIO) · (e_w − e_a)/(P − e_w) · (Pr/Sc)^a + ΔF/h_w',
        'ΔF = σ·ε_w·(½·(ε_a + ε_sfc)·T_a⁴ − T_w⁴) + (1 − α_w)·S·[(1 − f_dir)·(1 + D_w/(4·L_w)) + f_dir·(tan θ/π + D_w/(4·L_w)) + α_sfc]',
        'e_w = e_s(T_w); properties at (T_w + T_a)/2; the psychrometric wet bulb is the same balance without ΔF',
      ],
      symbols: [
        { symbol: 'T_w', meaning: 'natural wet-bulb temperature', unit: 'K' },
        { symbol: 'Sc', meaning: 'Schmidt number μ/(ρ·D_v)', unit: '–' },
        { symbol: 'h_w', meaning: 'heat-transfer coefficient of the wick', unit: 'W m⁻² K⁻¹' },
        { symbol: 'ΔF', meaning: 'net radiation gained by the wick', unit: 'W m⁻²' },
      ],
      constants: [
        SIGMA,
        exported('ε_w', 'wick emissivity', EMIS_WICK, '–', 'EMIS_WICK'),
        exported('α_w', 'wick albedo', ALB_WICK, '–', 'ALB_WICK'),
        D_W,
        exported('L_w', 'wick length', L_WICK, 'm', 'L_WICK'),
        exported('a', 'exponent of Pr/Sc (mass-transfer analogy)', WICK_EXPONENT, '–', 'WICK_EXPONENT'),
        exported('RATIO', 'c_p·M_a/M_w', RATIO, 'J kg⁻¹ K⁻¹', 'RATIO', 'c_p·M_a/M_w'),
        EPS_SFC,
        A_SFC,
        TOL,
        ITER,
      ],
      sources: ['liljegren2008'],
      code: ['pipeline/physics/liljegren-solve.ts solveWetBulb(), wetBulbRoot()', 'pipeline/physics/kernel.ts wbgtKernel()'],
    },
    {
      id: 'wbgt',
      name: 'Wet-bulb globe temperature (WBGT)',
      summary:
        'The outdoor WBGT from the three temperatures. Three exposures: in the sun; in the shade, modelled as the open sky with the sun removed (no solar load, the globe and wick still exchange long-wave radiation with the sky and the ground); and under a shelter (see the next method).',
      equation: [eq`WBGT = ${W_NW}·T_nw + ${W_G}·T_g + ${W_A}·T_a`],
      symbols: [
        { symbol: 'T_nw', meaning: 'natural wet-bulb temperature', unit: '°C' },
        { symbol: 'T_g', meaning: 'globe temperature', unit: '°C' },
        { symbol: 'T_a', meaning: 'air temperature', unit: '°C' },
      ],
      constants: [W_NW, W_G, W_A],
      sources: ['iso7243-2017', 'parsons2006', 'liljegren2008'],
      code: ['pipeline/physics/kernel.ts wbgtKernel()'],
    },
    {
      id: 'sheltered',
      name: 'Sheltered exposure (under a roof or canopy)',
      summary:
        'Work under a roof, an awning or a dense canopy open at the sides: no solar load, and the globe and wick see the shelter, taken as a black surface at the air temperature, instead of the sky (the ground is at the air temperature in every exposure). The same balances as in the open, with the sky\u2019s long-wave load replaced.',
      equation: [
        'L_shelter = ½·(ε_shelter + ε_sfc)·T_a⁴   in place of   L = ½·(ε_a + ε_sfc)·T_a⁴,   S = 0',
        eq`T_g and T_w from the globe and wick balances with L_shelter;   WBGT_shelter = ${W_NW}·T_nw + ${W_G}·T_g + ${W_A}·T_a`,
      ],
      symbols: [
        { symbol: 'ε_shelter', meaning: 'emissivity of the shelter', unit: '–' },
        { symbol: 'L, L_shelter', meaning: 'long-wave load on the globe and wick, open sky and shelter', unit: 'K⁴' },
      ],
      constants: [
        exported('ε_shelter', 'emissivity of the shelter (a black surface at the air temperature)', EMIS_SHELTER, '–', 'EMIS_SHELTER'),
        EPS_SFC,
        W_NW,
        W_G,
        W_A,
      ],
      sources: ['lemke2012', 'iso7243-2017', 'liljegren2008'],
      code: [
        'pipeline/physics/liljegren-solve.ts solveCell(), globeRoot(), wetBulbRoot() (exposure 2)',
        'pipeline/physics/kernel.ts wbgtKernel() (wbgtShelter)',
      ],
      notes: [
        'The radiation assumption is the one of the indoor and in-shade WBGT of Lemke & Kjellstrom (2012): no radiant heat source, the globe at about the air temperature. With it the globe reads within a few hundredths of a degree of the air temperature, so WBGT_shelter ≈ 0.7·T_nw + 0.3·T_g, the weighting ISO 7243 gives without solar load. The open-sky shade is cooler than this because a clear sky radiates like a body well below the air temperature.',
        'Not modelled: diffuse daylight and warm surfaces under or beside the shelter (a sun-heated roof, walls, machinery); where such sources exist, measure on site.',
      ],
    },
    {
      id: 'sun-position',
      name: 'Position of the sun',
      summary:
        'Declination, right ascension, sidereal time and Earth–Sun distance at the middle of each hour (low-accuracy solar coordinates, about 0.01°), and the cosine of the zenith angle per cell. Used for 1900–2100, which covers ERA5 from 1940.',
      equation: [
        eq`T = (JD − ${JD0})/${JC}   (Julian centuries; UT used for TT)`,
        eq`L₀ = ${L0} + ${L1}·T + ${L2}·T²,   M = ${M0} + ${M1}·T − ${M2}·T²   (degrees)`,
        eq`e = ${E0} − ${E1}·T − ${E2}·T²`,
        eq`C = (${C10} − ${C11}·T − ${C12}·T²)·sin M + (${C20} − ${C21}·T)·sin 2M + ${C3}·sin 3M`,
        eq`R = ${RA}·(1 − e²)/(1 + e·cos(M + C))   (AU)`,
        eq`Ω = ${ND0} − ${ND1}·T,   λ = L₀ + C − ${AB} − ${NU}·sin Ω`,
        eq`ε = ${EP0} − (${EP1}·T + ${EP2}·T² − ${EP3}·T³)/3600 + ${EPN}·cos Ω`,
        'sin δ = sin ε·sin λ,   α = atan2(cos ε·sin λ, cos λ)',
        eq`θ = ${TH0} + ${TH1}·(JD − ${JD0}) + ${TH2}·T² − T³/${TH3} − ${NU}·sin Ω·cos ε`,
        'h = θ + lon − α,   cos θ_z = sin φ·sin δ + cos φ·cos δ·cos h',
      ],
      symbols: [
        { symbol: 'JD', meaning: 'Julian date (exact, from the time in UTC)', unit: 'd' },
        { symbol: 'L₀, M, C, λ', meaning: 'mean longitude, mean anomaly, equation of the centre, apparent longitude', unit: '°' },
        { symbol: 'e, R', meaning: 'eccentricity of the Earth\u2019s orbit, Earth–Sun distance', unit: '–, AU' },
        { symbol: 'ε, δ, α, θ', meaning: 'obliquity, declination, right ascension, apparent sidereal time', unit: '°' },
        { symbol: 'h, φ, lon', meaning: 'hour angle, latitude, longitude', unit: '°' },
      ],
      constants: [
        JD0,
        JC,
        L0,
        L1,
        L2,
        M0,
        M1,
        M2,
        E0,
        E1,
        E2,
        C10,
        C11,
        C12,
        C20,
        C21,
        C3,
        RA,
        ND0,
        ND1,
        AB,
        NU,
        EP0,
        EP1,
        EP2,
        EP3,
        EPN,
        TH0,
        TH1,
        TH2,
        TH3,
        {
          symbol: 'Y₀',
          name: 'first year the formulas are used for',
          value: SOLAR_FIRST_YEAR,
          unit: 'year',
          code: 'pipeline/physics/solar-position.ts#SOLAR_FIRST_YEAR',
        },
        {
          symbol: 'Y₁',
          name: 'last year the formulas are used for',
          value: SOLAR_LAST_YEAR,
          unit: 'year',
          code: 'pipeline/physics/solar-position.ts#SOLAR_LAST_YEAR',
        },
      ],
      sources: ['meeus1998', 'reda2008'],
      code: [`${SUN}, hourAngle(), cosZenithInstant()`, 'pipeline/physics/geometry.ts geometryBlock()'],
      notes: [
        'Checked against the example of the NREL solar position algorithm report (Reda & Andreas 2008: declination within 0.0015°, hour angle within 0.0033°), against PyEphem 4.1.4 at 50 instants of 1900–2100 (cos θ_z within 10⁻⁴), and against the Astronomical Almanac formulas of the Liljegren reference code (Michalsky 1988) over their years 1950–2049 (cos θ_z within 0.75·10⁻⁴).',
        'Hours outside 1900–2100 get no value (status "time out of range").',
      ],
    },
    {
      id: 'refraction',
      name: 'Refraction near the horizon',
      summary: 'The apparent elevation of the sun, for the standard atmosphere (1013.25 hPa, 15 °C).',
      equation: [eq`R = ${R0}·(${R1} + ${R2}·e + ${R3}·e²) / (1 + ${R4}·e + ${R5}·e²)   for e ≥ ${R6}°, else 0`, 'apparent elevation = e + R (at most 90°)'],
      symbols: [
        { symbol: 'e', meaning: 'geometric elevation of the sun', unit: '°' },
        { symbol: 'R', meaning: 'refraction', unit: '°' },
      ],
      constants: [R0, R1, R2, R3, R4, R5, R6],
      sources: ['michalsky1988'],
      code: [`${REFR}, apparentCosZenith()`],
    },
    {
      id: 'solar-load',
      name: 'Solar load and its direct share',
      summary:
        'The reanalysis hour-mean irradiance is capped against the top of the atmosphere; the direct share comes from the data (ERA5 fdir/ssrd) or, without it, from the clearness.',
      equation: [
        'S_toa = S₀·cos θ/d²,   S = min(S_data, s_max·S_toa),   s* = S/S_toa',
        eq`f_dir = fdir/ssrd (ERA5), or without it min(exp(${K0} − ${K1}·s* − ${K2}/s*), f_max)`,
        'cos θ < CZA_min: S kept as given, f_dir = 0 (all diffuse)',
      ],
      symbols: [
        { symbol: 'S_data', meaning: 'global horizontal irradiance, hour mean (ssrd/3600)', unit: 'W m⁻²' },
        { symbol: 's*', meaning: 'clearness index after the cap', unit: '–' },
      ],
      constants: [S0, SMAX, FMAX, CZA, K0, K1, K2],
      sources: ['liljegren2008', 'ecmwf-era5'],
      code: ['pipeline/physics/solar-inputs.ts solarUsed(), directFractionEstimate()', 'pipeline/physics/geometry.ts geometryBlock()'],
      notes: ['ERA5 radiation is an accumulation over the hour ending at the time stamp; the sun\u2019s position is taken at the middle of that hour.'],
    },
    {
      id: 'wind-2m',
      name: 'Wind at 2 m',
      summary: 'The reanalysis 10 m wind brought down to the 2 m of the instruments by a power law whose exponent depends on the stability of the air.',
      equation: [
        'u₂ = max(u_z · (z_ref/z)^p, u_min),   z = 10 m',
        'p by stability class A–F (day: from wind and solar; night: from wind, with ΔT = 0, i.e. the stable column)',
      ],
      symbols: [
        { symbol: 'u_z', meaning: 'wind speed at height z (from u10, v10)', unit: 'm s⁻¹' },
        { symbol: 'p', meaning: 'power-law exponent', unit: '–' },
      ],
      constants: [
        ZREF,
        U_MIN,
        ...WIND_EXPONENT_RURAL.map((v, i) => exported(`p_rural,${'ABCDEF'[i]}`, `exponent, rural, class ${'ABCDEF'[i]}`, v, '–', `WIND_EXPONENT_RURAL.${i}`)),
        ...WIND_EXPONENT_URBAN.map((v, i) => exported(`p_urban,${'ABCDEF'[i]}`, `exponent, urban, class ${'ABCDEF'[i]}`, v, '–', `WIND_EXPONENT_URBAN.${i}`)),
      ],
      sources: ['epa2000', 'liljegren2008'],
      code: ['pipeline/physics/wind.ts stabilityClass(), windAt2m(), wind2mStep()'],
      notes: [
        'The rural exponents are used unless a cell is flagged urban. Reanalysis has no vertical temperature difference, so nights use the stable column (the lower 2 m wind).',
      ],
    },
    {
      id: 'delta-change',
      name: 'Scenarios: the delta change method',
      summary:
        'A what-if climate made from the record: every hour of a month at a cell is shifted by that month\u2019s change there, before the physics. The record\u2019s day-to-day and hour-to-hour weather is kept; only the monthly means change. A what-if, never a forecast.',
      equation: [
        'T\u2032 = T + ΔT_m;   S\u2032 = S·(1 + Δs_m) (global and direct);   pressure and wind kept',
        eq`relative: RH\u2032 = RH + Δh_m/100, clamped to [${RH_MIN}, 1];   e\u2032 = RH\u2032·e_s(T\u2032);   T_d\u2032 = e_s⁻¹(e\u2032)`,
        eq`specific: q = ${EPS_WA}·e/(p − (1 − ${EPS_WA})·e);   q\u2032 = q·(1 + Δh_m);   e\u2032 = q\u2032·p/(${EPS_WA} + (1 − ${EPS_WA})·q\u2032)`,
      ],
      symbols: [
        {
          symbol: 'ΔT_m, Δh_m, Δs_m',
          meaning: 'the month\u2019s change at the cell: temperature, humidity (RH points or relative change of q), relative change of solar radiation',
          unit: 'K, % points or –, –',
        },
        { symbol: 'e_s', meaning: 'saturation vapour pressure (Buck 1981, as above)', unit: 'hPa' },
      ],
      constants: [EPS_WA, RH_MIN],
      sources: ['buck1981'],
      code: ['pipeline/physics/delta-change.ts applyMonthlyChange()', 'pipeline/scenario/regrid.ts'],
      notes: [
        'A cell-month with no temperature and humidity change keeps its temperature and dew point exactly: a zero change gives the record itself. Each clamp of relative humidity is counted and reported.',
      ],
    },
  ],
};
