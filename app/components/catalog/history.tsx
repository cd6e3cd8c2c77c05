import { changesBetween, HistoryList } from "~/components/ui/history";
import { attributeFieldsFor, unitText } from "~/lib/catalog/attributes";
import { formatMoney } from "~/lib/format";
import { categoryLabel, humanize } from "~/lib/format/labels";

export type PartVersionView = {
  version: number;
  change: string;
  changed_at: string;
  changed_by_name: string | null;
  snapshot: Record<string, unknown>;
};

function attributesText(snap: Record<string, unknown>): string {
  const attrs = (snap.attributes ?? {}) as Record<string, unknown>;
  const known = attributeFieldsFor(String(snap.category ?? ""));
  const parts = Object.entries(attrs).map(([k, v]) => {
    const f = known.find((x) => x.key === k);
    return f ? `${f.label} ${v} ${unitText(f.unit)}` : `${humanize(k)} ${v}`;
  });
  return parts.join(", ") || "—";
}

const text = (v: unknown) => (v === null || v === undefined || v === "" ? "—" : String(v));

type Field = { label: string; show: (s: Record<string, unknown>) => string; mono?: boolean };
const FIELDS: Field[] = [
  { label: "Part number", show: (s) => text(s.part_number), mono: true },
  { label: "Category", show: (s) => (s.category ? categoryLabel(String(s.category)) : "—") },
  { label: "Maker", show: (s) => text(s.maker) },
  { label: "Name", show: (s) => text(s.name) },
  {
    label: "Price",
    show: (s) => (typeof s.price_cents === "number" ? formatMoney(s.price_cents) : "—"),
  },
  { label: "Labour", show: (s) => `${text(s.labour_hours)} h` },
  {
    label: "Tags",
    show: (s) => (Array.isArray(s.tags) && s.tags.length ? s.tags.join(" ") : "—"),
    mono: true,
  },
  { label: "Stock part", show: (s) => (s.stock ? "yes" : "no") },
  { label: "Measurements", show: attributesText },
  { label: "Notes", show: (s) => text(s.notes) },
  { label: "Archived", show: (s) => (s.archived ? "yes" : "no") },
];

/** Every version of a part, newest first, with what changed (prices only when the loader sent them). */
export function PartHistory({ versions }: { versions: PartVersionView[] }) {
  return (
    <HistoryList
      versions={versions}
      entry={(v, prev) => ({
        changedAt: v.changed_at,
        changedBy: v.changed_by_name,
        note: v.change,
        changes: changesBetween(prev?.snapshot, v.snapshot, FIELDS),
      })}
    />
  );
}
