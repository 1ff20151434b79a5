/**
 * Thermophysical properties of air and the convective heat-transfer coefficients of the globe
 * and the wick, as in the Liljegren et al. 2008 model (docs/methods.md §6.3–§6.4). Readable scalar
 * forms: the solver (`liljegren-solve.ts`) inlines the same formulas with hoisted terms, and the
 * tests pin the two against each other. Temperatures [K], pressure [hPa].
 */
import { CP_AIR, R_AIR, M_AIR, M_H2O, PRANDTL, SIGMA_LJ_AIR, EPS_K_AIR, MIN_SPEED, KELVIN } from './constants.ts';
import { saturationVaporPressureModel } from './humidity.ts';

/** Air density [kg m⁻³]: `ρ = 100·P/(R_air·T)` (docs/methods.md §6.3). @param tK [K]; @param p [hPa] */
export function airDensity(tK: number, p: number): number {
  return (100 * p) / (R_AIR * tK);
}

/**
 * Dynamic viscosity of air [kg m⁻¹ s⁻¹] (Bird–Stewart–Lightfoot; docs/methods.md §6.3):
 * `Ω = 1.048 − 0.034·(T/97 − 2.9)/0.4`, `μ = 2.6693e−6·√(M_a·T)/(3.617²·Ω)`. @param tK [K]
 */
export function airViscosity(tK: number): number {
  const omega = 1.048 - (0.034 * (tK / EPS_K_AIR - 2.9)) / 0.4;
  return (2.6693e-6 * Math.sqrt(M_AIR * tK)) / (SIGMA_LJ_AIR * SIGMA_LJ_AIR * omega);
}

/** Thermal conductivity of air [W m⁻¹ K⁻¹]: `k = (c_p + 1.25·R_air)·μ` (docs/methods.md §6.3). @param tK [K] */
export function airThermalConductivity(tK: number): number {
  return (CP_AIR + 1.25 * R_AIR) * airViscosity(tK);
}

/**
 * Diffusivity of water vapour in air [m² s⁻¹] (docs/methods.md §6.3, critical constants of air and
 * water): `D_v = 3.64e−4·(T/√(132·647.3))^2.334·(36.4·218)^(1/3)·(132·647.3)^(5/12)·√(1/M_a + 1/M_w)/(P/1013.25)·1e−4`.
 * @param tK [K]; @param p [hPa]
 */
export function vaporDiffusivity(tK: number, p: number): number {
  const tcrit = 132 * 647.3;
  return (
    ((3.64e-4 * Math.pow(tK / Math.sqrt(tcrit), 2.334) * Math.pow(36.4 * 218, 1 / 3) * Math.pow(tcrit, 5 / 12) * Math.sqrt(1 / M_AIR + 1 / M_H2O)) /
      (p / 1013.25)) *
    1e-4
  );
}

/** Latent heat of vaporisation [J kg⁻¹]: `2.4073e6 − 71100·(313.15 − T)/30` (docs/methods.md §6.3). @param tK [K] */
export function latentHeat(tK: number): number {
  return 2.4073e6 - (71100 * (313.15 - tK)) / 30;
}

/**
 * Atmospheric emissivity (Oke) [–]: `ε_a = 0.575·e_a^0.143` (docs/methods.md §6.3).
 * @param ea vapour pressure of the air [hPa]
 */
export function atmosphericEmissivity(ea: number): number {
  return 0.575 * Math.pow(ea, 0.143);
}

/** Schmidt number μ/(ρ·D_v) [–] (docs/methods.md §6.6). @param tK [K]; @param p [hPa] */
export function schmidtNumber(tK: number, p: number): number {
  return airViscosity(tK) / (airDensity(tK, p) * vaporDiffusivity(tK, p));
}

/** Reynolds number u·ρ·D/μ [–], u floored at 0.13 m s⁻¹ (docs/methods.md §6.4). */
export function reynoldsNumber(diameter: number, tK: number, p: number, speed: number): number {
  const u = Math.max(speed, MIN_SPEED);
  return (u * airDensity(tK, p) * diameter) / airViscosity(tK);
}

/**
 * Heat-transfer coefficient of a sphere [W m⁻² K⁻¹] (BSL p. 409; docs/methods.md §6.4):
 * `Nu = 2 + 0.6·Re^0.5·Pr^0.3333`, `h = Nu·k/D`.
 * @param diameter [m]; @param tK film temperature [K]; @param p [hPa]; @param speed [m s⁻¹]
 */
export function sphereHeatTransfer(diameter: number, tK: number, p: number, speed: number): number {
  const nu = 2 + 0.6 * Math.sqrt(reynoldsNumber(diameter, tK, p, speed)) * Math.pow(PRANDTL, 0.3333);
  return (nu * airThermalConductivity(tK)) / diameter;
}

/**
 * Heat-transfer coefficient of a cylinder in cross-flow [W m⁻² K⁻¹] (Bedingfield & Drew;
 * docs/methods.md §6.4): `Nu = 0.281·Re^0.6·Pr^0.44`, `h = Nu·k/D`.
 * @param diameter [m]; @param tK film temperature [K]; @param p [hPa]; @param speed [m s⁻¹]
 */
export function cylinderHeatTransfer(diameter: number, tK: number, p: number, speed: number): number {
  const nu = 0.281 * Math.pow(reynoldsNumber(diameter, tK, p, speed), 0.6) * Math.pow(PRANDTL, 0.44);
  return (nu * airThermalConductivity(tK)) / diameter;
}

/** Saturation vapour pressure of the model at a temperature in kelvin [hPa]. @param tK [K] */
export function saturationVaporPressureModelK(tK: number): number {
  return saturationVaporPressureModel(tK - KELVIN);
}
