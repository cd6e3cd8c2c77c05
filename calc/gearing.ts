/**
 * Gearing: engine speed at a road speed and road speed at an engine speed, through the
 * primary drive, the gear in use and the final drive (derived: each ratio divides the
 * shaft speed; the rear tyre travels one rolling circumference per turn).
 */
import { requirePositive } from "./errors";

/** 1 mile = 1.609344 km exactly (the 1959 international yard). */
export const KM_PER_MILE = 1.609344;

export interface DriveRatios {
  /** Rolling circumference of the rear tyre, mm. */
  tyreCircumferenceMm: number;
  /** Primary ratio (clutch basket teeth / engine sprocket teeth). */
  primaryRatio: number;
  /** Ratio of the gear in use (input turns per output turn). */
  gearRatio: number;
  /** Final drive ratio (rear pulley teeth / front pulley teeth). */
  finalRatio: number;
}

function overall(d: DriveRatios): number {
  requirePositive(d.tyreCircumferenceMm, "tyreCircumferenceMm");
  requirePositive(d.primaryRatio, "primaryRatio");
  requirePositive(d.gearRatio, "gearRatio");
  requirePositive(d.finalRatio, "finalRatio");
  return d.primaryRatio * d.gearRatio * d.finalRatio;
}

/** Engine speed, rpm, at a road speed, km/h. */
export function engineRpmAt(d: DriveRatios & { speedKmh: number }): number {
  const ratio = overall(d);
  requirePositive(d.speedKmh, "speedKmh");
  const wheelRpm = (d.speedKmh * 1e6) / 60 / d.tyreCircumferenceMm;
  return wheelRpm * ratio;
}

/** Road speed, km/h, at an engine speed, rpm. */
export function roadSpeedKmhAt(d: DriveRatios & { rpm: number }): number {
  const ratio = overall(d);
  requirePositive(d.rpm, "rpm");
  return ((d.rpm / ratio) * d.tyreCircumferenceMm * 60) / 1e6;
}

/** A ratio from tooth counts: driven / driving (e.g. rear pulley / front pulley). */
export function toothRatio(drivenTeeth: number, drivingTeeth: number): number {
  requirePositive(drivenTeeth, "drivenTeeth");
  requirePositive(drivingTeeth, "drivingTeeth");
  return drivenTeeth / drivingTeeth;
}

export function mphToKmh(mph: number): number {
  return mph * KM_PER_MILE;
}

export function kmhToMph(kmh: number): number {
  return kmh / KM_PER_MILE;
}
