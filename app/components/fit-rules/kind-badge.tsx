import type { RuleKind } from "../../../db/schema/catalog";

const STYLE: Record<RuleKind, string> = {
  conflict: "border-red text-red-text",
  upgrade: "border-teal text-teal-text",
  caution: "border-amber text-amber-text",
};
const LABEL: Record<RuleKind, string> = {
  conflict: "Conflict",
  upgrade: "Upgrade",
  caution: "Caution",
};

export function KindBadge({ kind }: { kind: RuleKind }) {
  return (
    <span
      className={`inline-block rounded border bg-white px-2 py-0.5 text-xs font-semibold uppercase tracking-wide ${STYLE[kind]}`}
    >
      {LABEL[kind]}
    </span>
  );
}
