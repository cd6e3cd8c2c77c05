import { changesBetween, HistoryList } from "~/components/ui/history";
import type { FitRuleVersion } from "../../../db/schema/catalog";
import { KindBadge } from "./kind-badge";

export type RuleVersionView = Omit<
  FitRuleVersion,
  "id" | "rule_id" | "changed_by" | "changed_at"
> & { changed_by_name: string | null; changed_at: string };

const show = (v: unknown) =>
  v === null || v === "" ? "—" : v === true ? "yes" : v === false ? "no" : String(v);

const FIELDS = (
  [
    ["name", "Name"],
    ["kind", "Kind"],
    ["condition", "Condition", true],
    ["message", "Message"],
    ["upgrade_category", "Upgrade category"],
    ["suggested_part_id", "Suggested part"],
    ["active", "Active"],
  ] as const
).map(([key, label, mono]) => ({ label, mono, show: (v: RuleVersionView) => show(v[key]) }));

/** Every version of a rule, newest first, each with its condition and message and what changed. */
export function RuleHistory({ versions }: { versions: RuleVersionView[] }) {
  return (
    <HistoryList
      versions={versions}
      entry={(v, prev) => ({
        changedAt: v.changed_at,
        changedBy: v.changed_by_name,
        badge: <KindBadge kind={v.kind} />,
        note: v.change_note,
        changes: changesBetween(prev, v, FIELDS),
        children: (
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
        ),
      })}
    />
  );
}
