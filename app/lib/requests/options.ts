// The choices of the build-request form and the queue's labels (ours), shared by the
// browser and the server.
import type { RequestStatus } from "../../../db/schema/requests";

export const STATUS_LABELS: Record<RequestStatus, string> = {
  new: "New",
  contacted: "Contacted",
  waiting_on_rider: "Waiting on rider",
  converted: "Converted",
  declined: "Declined",
};

export const RIDING = [
  { value: "solo_touring", label: "Solo touring" },
  { value: "two_up", label: "Two-up" },
  { value: "mountains", label: "Mountains" },
  { value: "track_days", label: "Track days" },
  { value: "city", label: "Around town" },
] as const;

export const BUDGETS = [
  { value: "under_3k", label: "Under $3,000" },
  { value: "3k_6k", label: "$3,000 – $6,000" },
  { value: "6k_10k", label: "$6,000 – $10,000" },
  { value: "10k_15k", label: "$10,000 – $15,000" },
  { value: "over_15k", label: "Over $15,000" },
  { value: "unsure", label: "Not sure yet" },
] as const;

/** In the order of urgency: the queue sorts by this rank. */
export const TIME_FRAMES = [
  { value: "asap", label: "As soon as possible", rank: 1 },
  { value: "1_month", label: "Within a month", rank: 2 },
  { value: "3_months", label: "Within three months", rank: 3 },
  { value: "season", label: "Before next riding season", rank: 4 },
  { value: "flexible", label: "No rush", rank: 5 },
] as const;

export const CONTACT_BY = [
  { value: "phone", label: "Phone call" },
  { value: "text", label: "Text message" },
  { value: "email", label: "E-mail" },
] as const;

const labelOf = (list: readonly { value: string; label: string }[], v: string) =>
  list.find((o) => o.value === v)?.label ?? v;

export const ridingLabel = (v: string) => labelOf(RIDING, v);
export const budgetLabel = (v: string) => labelOf(BUDGETS, v);
export const timeFrameLabel = (v: string) => labelOf(TIME_FRAMES, v);
export const contactLabel = (v: string) => labelOf(CONTACT_BY, v);

/** What the thank-you page and the confirmation mail promise. */
export const CALL_BACK_PROMISE =
  "Our service writer reads every request and gets back to you within two working days, the way you asked to be contacted.";
