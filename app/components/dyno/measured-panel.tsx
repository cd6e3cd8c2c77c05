// The package's measured figure (best corrected peaks of the counting runs) and what it
// changes in the fit rules' findings.
import type { MeasuredFigure } from "~/lib/dyno/measured";
import type { MeasuredEffect } from "~/lib/dyno/findings.server";
import { displayUnits } from "~/lib/dyno/run";
import { hpToKw } from "../../../calc";

export function MeasuredPanel({
  measured,
  effect,
  units,
}: {
  measured: MeasuredFigure | null;
  effect: MeasuredEffect | null;
  units: "inch" | "metric";
}) {
  const u = displayUnits(units);
  const power = (hp: number) => `${u.powerOf(hpToKw(hp)).toFixed(1)} ${u.power}`;
  return (
    <section
      aria-labelledby="measured-h"
      className="rounded border border-steel-200 bg-white p-3"
      data-testid="measured"
    >
      <h2 id="measured-h" className="text-lg font-semibold">
        Measured figure
      </h2>
      {measured ? (
        <>
          <p className="tabular-nums">
            <strong>{power(measured.powerHp)}</strong> at {measured.powerRpm} rpm and{" "}
            <strong>
              {u.torqueOf(measured.torqueNm).toFixed(1)} {u.torque}
            </strong>{" "}
            at {measured.torqueRpm} rpm — the best corrected peaks of {measured.runIds.length}{" "}
            counting run{measured.runIds.length === 1 ? "" : "s"}. The bench and the fit rules use
            it (power basis: measured)
            {effect?.specPowerHp != null
              ? ` in place of the spec's ${power(effect.specPowerHp)} (${effect.specBasis ?? "no basis"}).`
              : "."}
          </p>
          {effect && effect.changes.length > 0 ? (
            <ul className="mt-2 space-y-1" data-testid="finding-changes">
              {effect.changes.map((c) => (
                <li
                  key={`${c.change}-${c.ruleName}`}
                  className={`rounded border-l-4 p-2 ${c.kind === "conflict" ? "border-red" : c.kind === "upgrade" ? "border-teal" : "border-amber"}`}
                >
                  At {power(measured.powerHp)} measured, the rule “{c.ruleName}”{" "}
                  {c.change === "applies" ? "now applies" : "no longer applies"}: {c.message}
                </li>
              ))}
            </ul>
          ) : (
            <p className="mt-1 text-sm text-steel-700">
              No finding of the fit rules changes with the measured figure.
            </p>
          )}
        </>
      ) : (
        <p className="text-sm text-steel-700">
          None yet: mark a corrected run as counting, and its peaks replace the spec&apos;s power
          for the fit rules.
        </p>
      )}
    </section>
  );
}
