/**
 * Power from torque, and dyno correction to standard conditions.
 */
import { CalcInputError, requireFinite, requirePositive } from "./errors";

/**
 * The "5252" of hp = T·rpm/5252: 33000 ft·lbf/min per hp divided by 2π rad per rev,
 * used unrounded (5252.113…).
 */
export const HP_TORQUE_CONSTANT = 33000 / (2 * Math.PI);
/** The "9549" of kW = T·rpm/9549: 60000/(2π), unrounded. */
export const KW_TORQUE_CONSTANT = 60000 / (2 * Math.PI);

/** Power in kW from torque in N·m: P = T·2πN/60000. */
export function powerKw(torqueNm: number, rpm: number): number {
  requireFinite(torqueNm, "torqueNm");
  requireFinite(rpm, "rpm");
  return (torqueNm * 2 * Math.PI * rpm) / 60000;
}

/** Power in mechanical hp from torque in lb·ft: P = T·rpm/(33000/2π). */
export function powerHp(torqueLbFt: number, rpm: number): number {
  requireFinite(torqueLbFt, "torqueLbFt");
  requireFinite(rpm, "rpm");
  return (torqueLbFt * rpm) / HP_TORQUE_CONSTANT;
}

/** Name of the correction implemented by sae1349Factor, for screens and sheets. */
export const SAE_J1349_REVISION = "SAE J1349 JUN1990";
/** Reference conditions of SAE J1349 JUN1990: 25 °C, 99 kPa dry-air pressure. */
export const SAE_J1349_REFERENCE = { airTempC: 25, dryAirPressureKPa: 99 } as const;

export interface DynoAir {
  /** Intake air temperature, °C. */
  airTempC: number;
  /** Dry-air pressure, kPa (barometric minus water vapour pressure). */
  dryAirPressureKPa: number;
}

/**
 * SAE J1349 correction factor, the JUN1990 form:
 * CF = 1.18·(99/P_d)·√((T + 273)/298) − 0.18, P_d dry-air pressure in kPa, T in °C.
 * Equal to 1 at 25 °C and 99 kPa. Multiply observed power or torque by CF.
 */
export function sae1349Factor(air: DynoAir): number {
  requireFinite(air.airTempC, "airTempC");
  requirePositive(air.dryAirPressureKPa, "dryAirPressureKPa");
  if (!(air.airTempC > -273)) {
    throw new CalcInputError("airTempC", "must be above absolute zero");
  }
  return 1.18 * (99 / air.dryAirPressureKPa) * Math.sqrt((air.airTempC + 273) / 298) - 0.18;
}

/** Name of the saturation vapour pressure formula used by vaporPressureKPa. */
export const VAPOR_PRESSURE_FORMULA =
  "Magnus form, Alduchov & Eskridge (1996) coefficients, over water";

/**
 * Saturation vapour pressure of water, kPa, at tempC (°C):
 * 0.61094·exp(17.625·T/(T + 243.04)) (Magnus form, Alduchov & Eskridge 1996). Intended
 * for air temperatures of about −40 to +50 °C.
 */
export function vaporPressureKPa(tempC: number): number {
  requireFinite(tempC, "tempC");
  if (!(tempC > -243.04)) {
    throw new CalcInputError("tempC", "is outside the range of the formula");
  }
  return 0.61094 * Math.exp((17.625 * tempC) / (tempC + 243.04));
}

/**
 * Dry-air pressure, kPa: barometric pressure minus the water vapour partial pressure
 * (relative humidity × saturation vapour pressure at the air temperature).
 */
export function dryAirPressureKPa(baroKPa: number, tempC: number, relHumidityPct: number): number {
  requirePositive(baroKPa, "baroKPa");
  requireFinite(relHumidityPct, "relHumidityPct");
  if (relHumidityPct < 0 || relHumidityPct > 100) {
    throw new CalcInputError("relHumidityPct", "must be between 0 and 100");
  }
  const pd = baroKPa - (relHumidityPct / 100) * vaporPressureKPa(tempC);
  if (!(pd > 0)) {
    throw new CalcInputError("baroKPa", "is lower than the water vapour pressure");
  }
  return pd;
}

/** 4π: Heywood's 2π·n_R with n_R = 2 crank revolutions per power stroke (four-stroke). */
const FOUR_STROKE_2PI_NR = 4 * Math.PI;

/**
 * Brake torque, N·m, from brake mean effective pressure (kPa) and engine displacement
 * (cc), for a four-stroke: T = bmep·V_d/(2π·n_R), n_R = 2 (Heywood, Internal Combustion
 * Engine Fundamentals, McGraw-Hill 1988, §2.7). kPa × litres = J, so V_d in cc / 1000.
 */
export function torqueFromBmepNm(bmepKPa: number, displacementCc: number): number {
  requireFinite(bmepKPa, "bmepKPa");
  requirePositive(displacementCc, "displacementCc");
  return (bmepKPa * (displacementCc / 1000)) / FOUR_STROKE_2PI_NR;
}

/** Brake mean effective pressure, kPa, from torque (N·m) and displacement (cc): bmep = 4π·T/V_d. */
export function bmepKPa(torqueNm: number, displacementCc: number): number {
  requireFinite(torqueNm, "torqueNm");
  requirePositive(displacementCc, "displacementCc");
  return (FOUR_STROKE_2PI_NR * torqueNm) / (displacementCc / 1000);
}

/** Power per cubic inch, hp/ci. */
export function hpPerCi(hp: number, displacementCi: number): number {
  requireFinite(hp, "hp");
  requirePositive(displacementCi, "displacementCi");
  return hp / displacementCi;
}
