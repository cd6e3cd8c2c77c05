// Conditions for the benchmarks' generated fit rules: the shapes a shop writes, with
// thresholds varied by the rule's index so that some fire on a package and some do not.
export const GENERATED_CONDITIONS: ReadonlyArray<(i: number) => string> = [
  (i) => `power_hp > ${120 + (i % 60)} and has("stock-axle-adjusters")`,
  (i) => `riser_in > ${8 + (i % 8)} and has("stock-clutch-cable")`,
  () => 'filled("gasket") and filled("cylinder") and gasket.bore_mm < cylinder.bore_mm',
  (i) =>
    `known(cr_static) and cr_static > ${10 + (i % 20) / 10} and not has("compression-release")`,
  () => 'filled("cam") and filled("springs") and cam.lift_mm > springs.max_lift_mm',
  (i) =>
    `known(piston_speed_peak_ms) and piston_speed_peak_ms > ${22 + (i % 6)} or has("tw-part-${i}")`,
  (i) =>
    `known(rev_limit_rpm) and bore_mm / stroke_mm < ${0.8 + (i % 10) / 100} and rev_limit_rpm > 6000`,
];

export function generatedCondition(i: number): string {
  return GENERATED_CONDITIONS[i % GENERATED_CONDITIONS.length]!(i);
}
