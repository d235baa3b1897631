// Water-vapour relations for chamber air.
//
// Saturation vapour pressure follows Sonntag 1990 (Z. Meteorol. 40:340), T in K:
//   over water: ln e_w[hPa] = −6096.9385/T + 16.635794 − 2.711193e-2·T + 1.673952e-5·T² + 2.433502·ln T
//   over ice:   ln e_i[hPa] = −6024.5282/T + 24.7219 + 1.0613868e-2·T − 1.3198825e-5·T² − 0.49382577·ln T
// Both agree with the ASHRAE (Hyland–Wexler) values within about 0.01 % over −40…50 °C, which the
// tests check against ASHRAE Fundamentals and the `psychrolib` package.
//
// RH is always relative to liquid water, also below 0 °C (WMO convention), because that is what
// capacitive hygrometers report. Every inverse (dew/frost point) is solved numerically on the same
// formula as the forward direction, so converting there and back returns the input.

const KELVIN_OFFSET = 273.15;
/** Specific gas constant of water vapour, J/(kg·K). */
export const WATER_VAPOUR_GAS_CONSTANT = 461.5;
/** Triple point of water: ice and water saturation pressures are equal here. */
export const TRIPLE_POINT_C = 0.01;
/** Validity of Sonntag's formulas as used here (°C). */
export const WATER_RANGE_C: readonly [number, number] = [-100, 100];
export const ICE_RANGE_C: readonly [number, number] = [-100, TRIPLE_POINT_C];

export type SaturationPhase = "water" | "ice";

function lnEwHpa(tK: number): number {
  return -6096.9385 / tK + 16.635794 - 2.711193e-2 * tK + 1.673952e-5 * tK * tK + 2.433502 * Math.log(tK);
}

function dLnEwDT(tK: number): number {
  return 6096.9385 / (tK * tK) - 2.711193e-2 + 2 * 1.673952e-5 * tK + 2.433502 / tK;
}

function lnEiHpa(tK: number): number {
  return -6024.5282 / tK + 24.7219 + 1.0613868e-2 * tK - 1.3198825e-5 * tK * tK - 0.49382577 * Math.log(tK);
}

function dLnEiDT(tK: number): number {
  return 6024.5282 / (tK * tK) + 1.0613868e-2 - 2 * 1.3198825e-5 * tK - 0.49382577 / tK;
}

function checkTemp(tempC: number, range: readonly [number, number], what: string): void {
  if (!Number.isFinite(tempC) || tempC < range[0] || tempC > range[1]) {
    throw new RangeError(`${what} must be between ${range[0]} °C and ${range[1]} °C; got ${tempC}`);
  }
}

function checkRh(rhPercent: number): void {
  // 0 % would put the dew point at absolute zero; above 100 % is supersaturation, not a reading.
  if (!Number.isFinite(rhPercent) || rhPercent <= 0 || rhPercent > 100) {
    throw new RangeError(`RH must be above 0 % and at most 100 %; got ${rhPercent}`);
  }
}

/** Saturation vapour pressure in hPa over liquid water (default) or ice. */
export function saturationVaporPressureHpa(tempC: number, over: SaturationPhase = "water"): number {
  if (over === "ice") {
    checkTemp(tempC, ICE_RANGE_C, "Temperature over ice");
    return Math.exp(lnEiHpa(tempC + KELVIN_OFFSET));
  }
  checkTemp(tempC, WATER_RANGE_C, "Temperature");
  return Math.exp(lnEwHpa(tempC + KELVIN_OFFSET));
}

/** Partial pressure of water vapour (hPa) at a temperature and RH relative to water. */
export function vaporPressureHpa(tempC: number, rhPercent: number): number {
  checkRh(rhPercent);
  return (rhPercent / 100) * saturationVaporPressureHpa(tempC, "water");
}

/**
 * Newton's method on ln e_s(T) = ln e, in kelvin. ln e_s is smooth, increasing and nearly linear
 * in 1/T, so a start at the triple point converges in a handful of steps; the bracket keeps a
 * stray step inside the formula's range.
 */
function solveSaturationTempC(
  lnTargetHpa: number,
  lnEs: (tK: number) => number,
  dLnEs: (tK: number) => number,
  range: readonly [number, number],
): number {
  const lowK = range[0] + KELVIN_OFFSET;
  const highK = range[1] + KELVIN_OFFSET;
  if (lnTargetHpa < lnEs(lowK) || lnTargetHpa > lnEs(highK)) {
    throw new RangeError(`Vapour pressure is outside the range the formula covers (${range[0]}…${range[1]} °C)`);
  }
  let tK = KELVIN_OFFSET;
  for (let i = 0; i < 50; i++) {
    const step = (lnEs(tK) - lnTargetHpa) / dLnEs(tK);
    tK = Math.min(highK, Math.max(lowK, tK - step));
    if (Math.abs(step) < 1e-10) break;
  }
  return tK - KELVIN_OFFSET;
}

/** Dew point over liquid water, also below 0 °C (where it is below the frost point). */
export function dewPointC(tempC: number, rhPercent: number): number {
  const lnE = Math.log(vaporPressureHpa(tempC, rhPercent));
  return solveSaturationTempC(lnE, lnEwHpa, dLnEwDT, WATER_RANGE_C);
}

/**
 * Frost point: the temperature at which the air's vapour would saturate over ice. Where the vapour
 * pressure is above the triple-point pressure no ice can form, so the dew point over water is
 * returned instead (the same convention as ASHRAE and psychrolib).
 * Below 0 °C, air near water saturation is supersaturated over ice and the frost point comes out
 * above the air temperature: frost will grow. We return that value as is (psychrolib caps it at
 * the air temperature), so the inverse stays exact.
 */
export function frostPointC(tempC: number, rhPercent: number): number {
  const lnE = Math.log(vaporPressureHpa(tempC, rhPercent));
  if (lnE >= lnEwHpa(TRIPLE_POINT_C + KELVIN_OFFSET)) return dewPointC(tempC, rhPercent);
  return solveSaturationTempC(lnE, lnEiHpa, dLnEiDT, ICE_RANGE_C);
}

/** Which saturation a condensation point refers to. */
export type CondensationPoint = { tempC: number; over: SaturationPhase };

/**
 * What a chart should show as "the air's dew point": the dew point over water when the vapour
 * pressure is at or above the triple-point pressure (the value is ≥ 0.01 °C), otherwise the frost
 * point over ice, which is what forms on a cold surface there. The two differ below 0 °C (the
 * frost point is the higher), so the label must say which one it is.
 */
export function condensationPointC(tempC: number, rhPercent: number): CondensationPoint {
  const lnE = Math.log(vaporPressureHpa(tempC, rhPercent));
  if (lnE >= lnEwHpa(TRIPLE_POINT_C + KELVIN_OFFSET)) return { tempC: dewPointC(tempC, rhPercent), over: "water" };
  return { tempC: solveSaturationTempC(lnE, lnEiHpa, dLnEiDT, ICE_RANGE_C), over: "ice" };
}

/** RH (% over water) from air temperature and dew point over water. */
export function rhFromDewPointC(tempC: number, dewPointTempC: number): number {
  checkTemp(dewPointTempC, WATER_RANGE_C, "Dew point");
  // Loggers round both values, so a dew point a hair above the air temperature means saturation.
  if (dewPointTempC > tempC + 0.05) {
    throw new RangeError(`Dew point (${dewPointTempC} °C) cannot be above the air temperature (${tempC} °C)`);
  }
  const rh = (100 * saturationVaporPressureHpa(dewPointTempC)) / saturationVaporPressureHpa(tempC);
  return Math.min(100, rh);
}

/** Vapour density ρ = e/(R_v·T) in g/m³ (ideal gas; fine for air near room pressure). */
export function absoluteHumidityGm3(tempC: number, rhPercent: number): number {
  if (rhPercent === 0) {
    checkTemp(tempC, WATER_RANGE_C, "Temperature");
    return 0;
  }
  const ePa = vaporPressureHpa(tempC, rhPercent) * 100;
  return (ePa / (WATER_VAPOUR_GAS_CONSTANT * (tempC + KELVIN_OFFSET))) * 1000;
}
