import type { PackageStatus } from "../../../db/schema/packages";
import { statusLabel } from "~/lib/format/labels";

const STYLE: Record<PackageStatus, string> = {
  draft: "bg-steel-100 text-graphite",
  quoted: "bg-teal/10 text-teal-text",
  approved: "bg-green/10 text-green-text",
  in_build: "bg-amber/15 text-amber-text",
  on_dyno: "bg-amber/15 text-amber-text",
  delivered: "bg-green/10 text-green-text",
  cancelled: "bg-red/10 text-red-text",
};

export function StatusBadge({ status }: { status: PackageStatus }) {
  return (
    <span
      className={`rounded px-1.5 py-0.5 text-xs font-semibold ${STYLE[status]}`}
      data-testid="status"
    >
      {statusLabel(status)}
    </span>
  );
}
