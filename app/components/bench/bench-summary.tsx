// On a phone the bench is one long column: this strip of the key figures stays at the top
// of the screen while a builder works down the slots, and leads to the full results.
import type { BenchComputation, BenchFinding } from "~/lib/bench/spec";
import { show, type Units } from "~/lib/bench/units";

export function BenchSummary({
  computation,
  findings,
  units,
  pending,
}: {
  computation: BenchComputation;
  findings: BenchFinding[];
  units: Units;
  pending: boolean;
}) {
  const r = computation.results;
  const disp = show(r.displacementCc, "volume", units);
  const figures = [
    { label: "Displ.", ...disp },
    { label: "Static", ...show(r.staticCr, "ratio", units) },
    { label: "Dynamic", ...show(r.dynamicCr, "ratio", units) },
    { label: "Quench", ...show(r.quenchMm, "length", units) },
  ];
  const count = (k: BenchFinding["kind"]) =>
    findings.filter((f) => f.kind === k && !f.error).length;
  const conflicts = count("conflict");
  const upgrades = count("upgrade");
  // the fit rules' cautions and calc's own limits are both cautions to the reader
  const cautions = count("caution") + computation.cautions.length;
  const kinds = [
    [conflicts, "conflict"],
    [upgrades, "upgrade"],
    [cautions, "caution"],
  ] as const;
  const said = kinds.filter(([n]) => n > 0).map(([n, w]) => `${n} ${w}${n > 1 ? "s" : ""}`);
  return (
    <a
      href="#results-h"
      aria-label="Key figures; go to the results"
      data-testid="bench-summary"
      className="sticky top-0 z-20 -mx-3 mb-3 flex items-center gap-3 overflow-x-auto border-b border-graphite bg-ink px-3 py-1.5 text-white shadow lg:hidden"
    >
      {figures.map((f) => (
        <span key={f.label} className="flex shrink-0 flex-col leading-tight">
          <span className="text-[11px] text-steel-300">{f.label}</span>
          <span className="num text-sm font-semibold">
            {f.text}
            <span className="ml-0.5 text-[11px] font-normal text-steel-300">{f.unit}</span>
          </span>
        </span>
      ))}
      <span className="ml-auto flex shrink-0 flex-col text-right leading-tight">
        <span className="text-[11px] text-steel-300">{pending ? "checking…" : "Findings"}</span>
        <span
          className={`text-sm font-semibold ${conflicts ? "text-[#ff9d97]" : upgrades ? "text-[#ffd27a]" : "text-white"}`}
        >
          {said.length ? said.join(" · ") : "none tripped"}
        </span>
      </span>
    </a>
  );
}
