/**
 * Unit definitions and conversions.
 *
 * Every constant here is exact by definition (1 in = 25.4 mm; 1 lb = 0.45359237 kg;
 * standard gravity 9.80665 m/s²; 1 mechanical hp = 550 ft·lbf/s) or follows from those
 * by multiplication, except the conventional inch of mercury, NIST's rounded figure.
 * Conversions are plain functions on numbers; they do not validate.
 */

/** Millimetres per inch (exact). */
export const MM_PER_IN = 25.4;
/** Metres per foot (exact: 12 × 25.4 mm). */
export const M_PER_FT = 0.3048;
/** Cubic centimetres per cubic inch (exact: 2.54³). */
export const CC_PER_CI = 16.387064;
/** Kilograms per avoirdupois pound (exact). */
export const KG_PER_LB = 0.45359237;
/** Standard acceleration of gravity, m/s² (exact). */
export const STANDARD_GRAVITY = 9.80665;
/** Newtons per pound-force (= 0.45359237 kg × 9.80665 m/s²). */
export const N_PER_LBF = KG_PER_LB * STANDARD_GRAVITY;
/** Newton-metres per pound-force foot. */
export const NM_PER_LBFT = N_PER_LBF * M_PER_FT;
/** Watts per mechanical horsepower (550 ft·lbf/s). */
export const W_PER_HP = 550 * NM_PER_LBFT;
/** Kilowatts per mechanical horsepower. */
export const KW_PER_HP = W_PER_HP / 1000;

export function inToMm(inches: number): number {
  return inches * MM_PER_IN;
}
export function mmToIn(mm: number): number {
  return mm / MM_PER_IN;
}
export function ccToCi(cc: number): number {
  return cc / CC_PER_CI;
}
export function ciToCc(ci: number): number {
  return ci * CC_PER_CI;
}
export function nmToLbFt(nm: number): number {
  return nm / NM_PER_LBFT;
}
export function lbFtToNm(lbft: number): number {
  return lbft * NM_PER_LBFT;
}
export function kwToHp(kw: number): number {
  return kw / KW_PER_HP;
}
export function hpToKw(hp: number): number {
  return hp * KW_PER_HP;
}
/** Metres per second to feet per minute (the trade's unit for piston speed). */
export function msToFtMin(ms: number): number {
  return (ms * 60) / M_PER_FT;
}
/** Feet per minute to metres per second. */
export function ftMinToMs(ftMin: number): number {
  return (ftMin * M_PER_FT) / 60;
}
/** Degrees Celsius to degrees Fahrenheit. */
export function cToF(c: number): number {
  return (c * 9) / 5 + 32;
}
/** Degrees Fahrenheit to degrees Celsius. */
export function fToC(f: number): number {
  return ((f - 32) * 5) / 9;
}
/**
 * Kilopascals per conventional inch of mercury (NIST SP 811, 2008 edition, Appendix B.8,
 * "inch of mercury, conventional (inHg)": 3.386 389 E+03 Pa). Not the inch of mercury at
 * 32 °F, a separate entry of the same table (3.386 38 E+03 Pa). Barometers and dyno
 * weather stations read in the conventional unit.
 */
export const KPA_PER_INHG_CONVENTIONAL = 3.386389;
/** @deprecated the same constant under its earlier name; use KPA_PER_INHG_CONVENTIONAL */
export const KPA_PER_INHG = KPA_PER_INHG_CONVENTIONAL;
/** Conventional inches of mercury to kilopascals. */
export function inHgToKPa(inHg: number): number {
  return inHg * KPA_PER_INHG_CONVENTIONAL;
}
