import type { SpecChange } from "~/lib/bench/spec";

type Side = { kind: "revision" | "edit"; number: number; label: string; recomputed: boolean };

export type Compare = {
  a: Side;
  b: Side;
  specChanges: SpecChange[];
  resultChanges: { key: string; label: string; before: string; after: string }[];
  findingsAdded: string[];
  findingsGone: string[];
};

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

export function RevisionCompare({ compare: c }: { compare: Compare }) {
  const rows = [...c.specChanges, ...c.resultChanges];
  return (
    <div className="mt-3 rounded border border-steel-200 p-2" data-testid="revision-compare">
      <p className="text-sm font-semibold">
        {cap(c.a.label)} → {c.b.label}
      </p>
      {c.a.recomputed || c.b.recomputed ? (
        <p className="text-xs text-steel-700">
          A single edit's figures are recomputed from its spec, and its findings come from the fit
          rules in force now.
        </p>
      ) : null}
      {rows.length === 0 ? (
        <p className="text-sm text-steel-700">No field differs.</p>
      ) : (
        <table className="mt-1 w-full text-left text-sm">
          <thead className="text-xs text-steel-700">
            <tr>
              <th>Field</th>
              <th>{cap(c.a.label)}</th>
              <th>{cap(c.b.label)}</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.key} className="border-t border-steel-100">
                <td className="py-0.5">{r.label}</td>
                <td className="num">{r.before}</td>
                <td className="num font-semibold">{r.after}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {c.findingsAdded.length ? (
        <p className="mt-1 text-sm text-red-text">New findings: {c.findingsAdded.join(", ")}</p>
      ) : null}
      {c.findingsGone.length ? (
        <p className="mt-1 text-sm text-green-text">
          Findings cleared: {c.findingsGone.join(", ")}
        </p>
      ) : null}
    </div>
  );
}
