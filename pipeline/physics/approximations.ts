/**
 * Simplified estimates, for comparison and for the methods page only. These are approximations,
 * not the atlas's WBGT (which is the full Liljegren model in kernel.ts).
 */

/**
 * Stull (2011) wet bulb [°C] at sea-level pressure (docs/methods.md §7.1; valid RH 5–99 %,
 * T −20…50 °C): `T·atan(0.151977·√(RH + 8.313659)) + atan(T + RH) − atan(RH − 1.676331) +
 * 0.00391838·RH^1.5·atan(0.023101·RH) − 4.686035`. @param t [°C]; @param rh [%]
 */
export function wetBulbStull2011(t: number, rh: number): number {
  return (
    t * Math.atan(0.151977 * Math.sqrt(rh + 8.313659)) +
    Math.atan(t + rh) -
    Math.atan(rh - 1.676331) +
    0.00391838 * Math.pow(rh, 1.5) * Math.atan(0.023101 * rh) -
    4.686035
  );
}

/**
 * Australian Bureau of Meteorology simplified WBGT [°C] (docs/methods.md §7.3; an approximation that
 * ignores wind and radiation): `e = (RH/100)·6.105·exp(17.27·T/(237.7 + T))` [hPa],
 * `WBGT = 0.567·T + 0.393·e + 3.94`. @param t [°C]; @param rh [%]
 */
export function wbgtBureauOfMeteorology(t: number, rh: number): number {
  const e = (rh / 100) * 6.105 * Math.exp((17.27 * t) / (237.7 + t));
  return 0.567 * t + 0.393 * e + 3.94;
}

/**
 * Bernard psychrometric wet bulb regression [°C] (docs/methods.md §7.2):
 * `Tpwb = 0.376 + 5.79·e_a + (0.388 − 0.0465·e_a)·T`, e_a [kPa] from `0.6107·exp(17.27 Td/(Td + 237.3))`.
 * @param t [°C]; @param ea vapour pressure [kPa]
 */
export function psychrometricWetBulbBernard(t: number, ea: number): number {
  return 0.376 + 5.79 * ea + (0.388 - 0.0465 * ea) * t;
}

/**
 * Bernard natural wet bulb from the psychrometric one [°C] (docs/methods.md §7.2).
 * @param t air [°C]; @param tpwb psychrometric wet bulb [°C]; @param tg globe [°C]; @param v air speed [m s⁻¹]
 */
export function naturalWetBulbBernard(t: number, tpwb: number, tg: number, v: number): number {
  if (tg - t < 4) {
    const c = v < 0.03 ? 0.85 : v > 3 ? 1 : 0.96 + 0.069 * Math.log10(v);
    return t - c * (t - tpwb);
  }
  const ef = v < 0.1 ? 1.1 : v > 1 ? -0.1 : 0.1 / Math.pow(v, 1.1) - 0.2;
  return tpwb + 0.25 * (tg - t) + ef;
}

/**
 * Lemke & Kjellstrom (2012) indoor WBGT [°C] (docs/methods.md §7.2): Tpwb solved by bisection from
 * `1556·e_d − 1.484·e_d·Tw − 1556·e_w + 1.484·e_w·Tw + 1010·(T − Tw) = 0`, e [hPa] by
 * `6.106·exp(17.27·T/(237.3 + T))`; `WBGT = 0.67·Tpwb + 0.33·T`. Returns both.
 * @param t [°C]; @param td dew point [°C]
 */
export function wbgtIndoorLemkeKjellstrom(t: number, td: number): { tpwb: number; wbgt: number } {
  const es = (x: number) => 6.106 * Math.exp((17.27 * x) / (237.3 + x));
  const ed = es(td);
  const f = (tw: number) => {
    const ew = es(tw);
    return 1556 * ed - 1.484 * ed * tw - 1556 * ew + 1.484 * ew * tw + 1010 * (t - tw);
  };
  let lo = Math.min(td, t) - 1;
  let hi = t + 1;
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  const tpwb = 0.5 * (lo + hi);
  return { tpwb, wbgt: 0.67 * tpwb + 0.33 * t };
}
