// What the quote needs from the bike and its keep-check: the part each slot carries now
// (its engine family's stock part, or the catalog part fitted since), so that only slots
// the package changes are priced; and the installed parts the keep-check marks for
// replacement that the package does not replace yet, for the service writer to settle.
import type { Db } from "../db.server";
import { computeKeepCheck } from "../keep-check/keep-check.server";
import { startingSpecForBike } from "../packages/from-bike.server";
import { SLOTS } from "../packages/slots";

export type KeepCheckForQuote = {
  /** slot key → the part id the bike carries there now */
  baseline: Record<string, number | null>;
  /** installed parts to replace whose replacement is priced from the bench or an added line */
  replace: { slot: string | null; partId: number; reason: string }[];
  /** installed parts marked "replace" that nothing on the quote replaces yet */
  unresolved: string[];
};

export async function keepCheckForQuote(db: Db, packageId: number): Promise<KeepCheckForQuote> {
  const pkg = await db
    .selectFrom("packages")
    .select(["bike_id"])
    .where("id", "=", packageId)
    .executeTakeFirst();
  if (!pkg?.bike_id) return { baseline: {}, replace: [], unresolved: [] };
  const [carried, check] = await Promise.all([
    startingSpecForBike(db, pkg.bike_id),
    computeKeepCheck(db, packageId),
  ]);
  const baseline: Record<string, number | null> = {};
  for (const [slot, fill] of Object.entries(carried.slots))
    if (fill.partId !== null) baseline[slot] = fill.partId;
  const spec = await db
    .selectFrom("packages")
    .select("spec")
    .where("id", "=", packageId)
    .executeTakeFirstOrThrow();
  const slots = (spec.spec as { slots?: Record<string, { partId: number | null }> }).slots ?? {};
  const toReplace = (check?.rows ?? []).filter((r) => r.mark === "replace");
  const categories = new Map(
    toReplace.length
      ? (
          await db
            .selectFrom("bike_parts")
            .select(["id", "category"])
            .where(
              "id",
              "in",
              toReplace.map((r) => r.bikePartId),
            )
            .execute()
        ).map((r) => [r.id, r.category])
      : [],
  );
  const unresolved: string[] = [];
  for (const row of toReplace) {
    const category = categories.get(row.bikePartId);
    const slot = SLOTS.find((s) => s.category === category)?.key ?? null;
    const replacedOnBench =
      slot !== null && slots[slot]?.partId != null && slots[slot]?.partId !== baseline[slot];
    if (!replacedOnBench) unresolved.push(`${row.categoryLabel}: ${row.label}`);
  }
  return { baseline, replace: [], unresolved };
}
