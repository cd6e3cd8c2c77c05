import type { SpecChange } from "~/lib/bench/spec";

export type Compare = {
  a: { revision: number };
  b: { revision: number };
  specChanges: SpecChange[];
  resultChanges: { key: string; label: string; before: string; after: string }[];
  findingsAdded: string[];
  findingsGone: string[];
};

export function RevisionCompare({ compare: c }: { compare: Compare }) {
  const rows = [...c.specChanges, ...c.resultChanges];
  return (
    <div className="mt-3 rounded border border-steel-200 p-2" data-testid="revision-compare">
      <p className="text-sm font-semibold">
        Revision {c.a.revision} → revision {c.b.revision}
      </p>
      {rows.length === 0 ? (
        <p className="text-sm text-steel-700">No field differs.</p>
      ) : (
        <table className="mt-1 w-full text-left text-sm">
          <thead className="text-xs text-steel-700">
            <tr>
              <th>Field</th>
              <th>Revision {c.a.revision}</th>
              <th>Revision {c.b.revision}</th>
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
