import { KindBadge } from "./kind-badge";
import type { RuleKind } from "../../../db/schema/catalog";

export type RuleVersionView = {
  version: number;
  name: string;
  kind: RuleKind;
  condition: string;
  message: string;
  upgrade_category: string | null;
  suggested_part_id: number | null;
  active: boolean;
  change_note: string;
  changed_by_name: string | null;
  changed_at: string;
};

const FIELDS = [
  ["name", "Name"],
  ["kind", "Kind"],
  ["condition", "Condition"],
  ["message", "Message"],
  ["upgrade_category", "Upgrade category"],
  ["suggested_part_id", "Suggested part"],
  ["active", "Active"],
] as const;

const dateFmt = new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });
const show = (v: unknown) => (v === null || v === "" ? "—" : v === true ? "yes" : v === false ? "no" : String(v));

/** Every version of a rule, newest first, each with what changed from the one before. */
export function RuleHistory({ versions }: { versions: RuleVersionView[] }) {
  return (
    <ol className="space-y-3">
      {versions.map((v, i) => {
        const prev = versions[i + 1];
        const changed = prev ? FIELDS.filter(([k]) => prev[k] !== v[k]) : [];
        return (
          <li key={v.version} className="rounded border border-steel-200 bg-white p-3 text-sm">
            <p className="flex flex-wrap items-center gap-2">
              <span className="num font-semibold text-ink">v{v.version}</span>
              <KindBadge kind={v.kind} />
              <span className="text-steel-700">
                <span className="num">{dateFmt.format(new Date(v.changed_at))} UTC</span>
                {v.changed_by_name ? ` · ${v.changed_by_name}` : ""}
              </span>
            </p>
            {v.change_note ? <p className="mt-1 text-graphite">{v.change_note}</p> : null}
            <dl className="mt-2 space-y-1">
              <div>
                <dt className="inline font-semibold text-graphite">Condition: </dt>
                <dd className="inline break-all font-mono text-ink">{v.condition}</dd>
              </div>
              <div>
                <dt className="inline font-semibold text-graphite">Message: </dt>
                <dd className="inline text-ink">{v.message}</dd>
              </div>
            </dl>
            {prev ? (
              changed.length ? (
                <div className="mt-2 border-t border-steel-100 pt-2">
                  <p className="font-semibold text-graphite">Changed from v{prev.version}:</p>
                  <ul className="mt-1 space-y-1">
                    {changed.map(([k, label]) => (
                      <li key={k}>
                        <span className="font-medium text-graphite">{label}: </span>
                        <del className="break-all bg-steel-50 text-red-text">{show(prev[k])}</del> → <ins className="break-all text-green-text no-underline">{show(v[k])}</ins>
                      </li>
                    ))}
                  </ul>
                </div>
              ) : (
                <p className="mt-2 text-steel-700">Same as v{prev.version}.</p>
              )
            ) : (
              <p className="mt-2 text-steel-700">First version.</p>
            )}
          </li>
        );
      })}
    </ol>
  );
}
