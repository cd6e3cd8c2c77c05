// The words a screen shows for the code's own names: part categories, slots, package
// statuses. A name the code does not know reads as words, never as a slug.
import type { PackageStatus } from "../../../db/schema/packages";
import { BUILT_IN_CATEGORIES, SLOT_BY_KEY } from "../packages/slots";

export const STATUS_LABELS: Record<PackageStatus, string> = {
  draft: "Draft",
  quoted: "Quoted",
  approved: "Approved",
  in_build: "In build",
  on_dyno: "On the dyno",
  delivered: "Delivered",
  cancelled: "Cancelled",
};

const CATEGORY_LABELS: ReadonlyMap<string, string> = new Map(
  BUILT_IN_CATEGORIES.map((c) => [c.slug, c.label]),
);

/** "snake_case_words" → "Snake case words". */
export function humanize(key: string): string {
  const words = key
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[_-]+/g, " ")
    .trim()
    .toLowerCase();
  return words ? words[0]!.toUpperCase() + words.slice(1) : key;
}

/** A category's label; `known` holds the shop's own categories (slug → label). */
export function categoryLabel(slug: string, known?: ReadonlyMap<string, string>): string {
  return known?.get(slug) ?? CATEGORY_LABELS.get(slug) ?? humanize(slug);
}

export function slotLabel(key: string): string {
  return Object.hasOwn(SLOT_BY_KEY, key) ? SLOT_BY_KEY[key]!.label : humanize(key);
}

export function statusLabel(status: string): string {
  return Object.hasOwn(STATUS_LABELS, status)
    ? STATUS_LABELS[status as PackageStatus]
    : humanize(status);
}
