/**
 * Standard air pressure at altitude: the U.S. Standard Atmosphere 1976 (NOAA, NASA and
 * USAF, Washington DC 1976), lowest layer (the troposphere, 0 to 11 km geopotential),
 * eq. 33a: P = P_b·[T_b/(T_b + L_b·(H − H_b))]^(g0'·M0/(R*·L_b)), with H_b = 0,
 * P_b = 101 325 Pa, T_b = 288.15 K, L_b = −6.5 K/km. Geometric altitude Z is turned
 * into geopotential H = r0·Z/(r0 + Z), eq. 18.
 */
import { CalcInputError, requireFinite } from "./errors";

/** Sea-level pressure, kPa (U.S. Standard Atmosphere 1976, Table 2). */
export const STD_SEA_LEVEL_KPA = 101.325;
/** Sea-level temperature, K. */
export const STD_SEA_LEVEL_K = 288.15;
/** Temperature gradient of the troposphere, K per geopotential metre. */
export const STD_LAPSE_K_PER_M = -0.0065;
/** Effective Earth radius for geopotential height, m (the 1976 standard's r0). */
export const STD_EARTH_RADIUS_M = 6356766;
/** g0'·M0/R*, with g0' = 9.80665 m²/(s²·m'), M0 = 28.9644 kg/kmol, R* = 8.31432 J/(mol·K). */
const GM_OVER_R = (9.80665 * 0.0289644) / 8.31432;
const EXPONENT = GM_OVER_R / -STD_LAPSE_K_PER_M;
/** Top of the troposphere, geopotential m. */
export const TROPOPAUSE_GEOPOTENTIAL_M = 11000;
/** Lowest altitude accepted, m: a little below the lowest dry land. */
export const LOWEST_ALTITUDE_M = -500;

export const STANDARD_ATMOSPHERE = "U.S. Standard Atmosphere 1976, troposphere";

/** Geopotential height, m, of a geometric altitude, m (eq. 18). */
export function geopotentialHeightM(altitudeM: number): number {
  requireFinite(altitudeM, "altitudeM");
  return (STD_EARTH_RADIUS_M * altitudeM) / (STD_EARTH_RADIUS_M + altitudeM);
}

/**
 * Standard pressure, kPa, at a geometric altitude above sea level, m, within the
 * troposphere (−500 m to the tropopause, about 11 019 m).
 */
export function standardPressureKPa(altitudeM: number): number {
  const h = geopotentialHeightM(altitudeM);
  if (!(altitudeM >= LOWEST_ALTITUDE_M && h <= TROPOPAUSE_GEOPOTENTIAL_M)) {
    throw new CalcInputError(
      "altitudeM",
      "must be between −500 m and the top of the troposphere (about 11 000 m)",
    );
  }
  const t = STD_SEA_LEVEL_K + STD_LAPSE_K_PER_M * h;
  return STD_SEA_LEVEL_KPA * Math.pow(t / STD_SEA_LEVEL_K, EXPONENT);
}
