// The package at a glance: who and which bike, the key figures in the viewer's units, the
// parts by slot, the open findings, and the next step for the viewer's role.
import { Link } from "react-router";
import type { BenchComputation, BenchFinding, BenchPart, BenchSpec } from "~/lib/bench/spec";
import { show, type Units } from "~/lib/bench/units";
import { formatNumber } from "~/lib/format";
import { SLOTS } from "~/lib/packages/slots";

const KIND_LABEL = { conflict: "Conflict", upgrade: "Upgrade needed", caution: "Caution" };
const KIND_ORDER = { conflict: 0, upgrade: 1, caution: 2 };

export function PackageSummary(props: {
  id: number;
  customer: string | null;
  bike: string | null;
  spec: BenchSpec;
  computation: BenchComputation;
  findings: BenchFinding[];
  parts: BenchPart[];
  units: Units;
  nextStep: { text: string; link: string | null; label: string };
}) {
  const { computation: c, units } = props;
  const r = c.results;
  const byId = new Map(props.parts.map((p) => [p.id, p]));
  const figures = [
    {
      label: "Displacement",
      text:
        r.displacementCi === null
          ? "—"
          : `${formatNumber(r.displacementCi, 1)} ci · ${formatNumber(r.displacementCc ?? 0, 0)} cc`,
    },
    { label: "Static compression", ...line(show(r.staticCr, "ratio", units)) },
    { label: "Dynamic compression", ...line(show(r.dynamicCr, "ratio", units)) },
    { label: "Quench", ...line(show(r.quenchMm, "length", units)) },
    { label: "Peak piston speed", ...line(show(r.peakPistonSpeedMs, "speed", units)) },
    { label: "Rev limit", ...line(show(props.spec.revLimitRpm, "rpm", units)) },
  ];
  const open = props.findings
    .filter((f) => !f.error)
    .sort((a, b) => KIND_ORDER[a.kind] - KIND_ORDER[b.kind]);
  const filled = SLOTS.filter((s) => props.spec.slots[s.key]?.partId != null);
  return (
    <div className="mt-4 grid gap-4 lg:grid-cols-3" data-testid="package-summary">
      <section
        aria-labelledby="next-h"
        className="rounded border border-teal-dark bg-white p-3 lg:col-span-3"
      >
        <h2 id="next-h" className="font-semibold text-ink">
          Next step
        </h2>
        <p className="mt-1 text-graphite">{props.nextStep.text}</p>
        {props.nextStep.link ? (
          <Link
            to={props.nextStep.link}
            className="mt-2 inline-block rounded bg-teal-dark px-3 py-1.5 font-semibold text-white hover:bg-ink"
          >
            {props.nextStep.label}
          </Link>
        ) : null}
      </section>
      <section aria-labelledby="who-h" className="rounded border border-steel-200 bg-white p-3">
        <h2 id="who-h" className="font-semibold text-ink">
          Customer and bike
        </h2>
        <p className="mt-1">{props.customer ?? "A shop template: no customer"}</p>
        <p className="text-steel-700">{props.bike ?? "No bike"}</p>
        <h3 className="mt-3 text-sm font-semibold text-ink">Key figures</h3>
        <dl className="mt-1 grid grid-cols-1 gap-1 text-sm">
          {figures.map((f) => (
            <div
              key={f.label}
              className="flex justify-between gap-2 border-t border-steel-100 pt-1"
            >
              <dt className="text-steel-700">{f.label}</dt>
              <dd className="num font-semibold text-ink">{f.text}</dd>
            </div>
          ))}
        </dl>
      </section>
      <section aria-labelledby="parts-h" className="rounded border border-steel-200 bg-white p-3">
        <h2 id="parts-h" className="font-semibold text-ink">
          Parts by slot{" "}
          <span className="text-sm font-normal text-steel-700">
            ({filled.length} of {SLOTS.length} filled)
          </span>
        </h2>
        <ul className="mt-1 text-sm">
          {SLOTS.map((s) => {
            const id = props.spec.slots[s.key]?.partId;
            const part = id != null ? byId.get(id) : undefined;
            return (
              <li
                key={s.key}
                className="flex flex-wrap justify-between gap-x-2 border-t border-steel-100 py-0.5"
              >
                <span className="text-steel-700">{s.label}</span>
                <span className={part ? "text-graphite" : "italic text-steel-700"}>
                  {part ? `${part.name} · ${part.partNumber}` : "empty"}
                </span>
              </li>
            );
          })}
        </ul>
      </section>
      <section
        aria-labelledby="findings-h"
        className="rounded border border-steel-200 bg-white p-3"
      >
        <h2 id="findings-h" className="font-semibold text-ink">
          Open findings{" "}
          <span className="text-sm font-normal text-steel-700">
            ({open.length} from the fit rules, {c.cautions.length} from the limits)
          </span>
        </h2>
        {open.length === 0 && c.cautions.length === 0 ? (
          <p className="mt-1 text-sm text-steel-700">No fit rule or limit is tripped.</p>
        ) : null}
        <ul className="mt-1 space-y-1.5 text-sm">
          {open.map((f) => (
            <li
              key={`${f.ruleId}-${f.ruleVersion}`}
              className={`border-l-4 pl-2 ${f.kind === "conflict" ? "border-red" : f.kind === "upgrade" ? "border-amber" : "border-steel-500"}`}
            >
              <p className="font-semibold text-ink">
                {KIND_LABEL[f.kind]} · {f.ruleName}
              </p>
              <p className="text-graphite">{f.message}</p>
            </li>
          ))}
          {c.cautions.map((k) => (
            <li key={k.code} className="border-l-4 border-amber pl-2">
              <p className="font-semibold text-ink">Caution · limit</p>
              <p className="text-graphite">{k.message}</p>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}

function line(s: { text: string; unit: string }): { text: string } {
  if (s.text === "—") return { text: "—" };
  return { text: s.unit.startsWith(":") ? `${s.text}${s.unit}` : `${s.text} ${s.unit}` };
}
