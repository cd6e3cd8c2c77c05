import type { RequestStatus } from "../../../db/schema/requests";
import { STATUS_LABELS } from "~/lib/requests/options";

const STYLE: Record<RequestStatus, string> = {
  new: "bg-teal/10 text-teal-text",
  contacted: "bg-steel-100 text-graphite",
  waiting_on_rider: "bg-amber/15 text-amber-text",
  converted: "bg-green/10 text-green-text",
  declined: "bg-red/10 text-red-text",
};

export function RequestStatusBadge({ status }: { status: RequestStatus }) {
  return (
    <span
      className={`whitespace-nowrap rounded px-1.5 py-0.5 text-xs font-semibold ${STYLE[status]}`}
      data-testid="request-status"
    >
      {STATUS_LABELS[status]}
    </span>
  );
}

/** "3 days ago" from an ISO time (server and browser agree: both get `now`). */
export function ageText(iso: string, now: number): string {
  const minutes = Math.max(0, Math.round((now - new Date(iso).getTime()) / 60_000));
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.round(minutes / 60);
  if (hours < 48) return `${hours} h`;
  return `${Math.round(hours / 24)} days`;
}

export function when(iso: string): string {
  return new Date(iso).toISOString().slice(0, 16).replace("T", " ");
}
