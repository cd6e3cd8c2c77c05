// A bike: its record, the parts it carries now (each a catalog part or free text with a
// category, with when and at what mileage it was fitted), its packages and its history.
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { BikeInput, BikePartInput } from "./forms";

export async function getBike(db: Db, id: number) {
  const b = await db
    .selectFrom("bikes as b")
    .innerJoin("customers as c", "c.id", "b.customer_id")
    .leftJoin("engine_families as f", "f.id", "b.engine_family_id")
    .select([
      "b.id",
      "b.customer_id",
      "b.year",
      "b.model",
      "b.vin",
      "b.mileage",
      "b.notes",
      "b.engine_family_id",
      "b.created_at",
      "f.name as family",
      "c.name as customer",
    ])
    .where("b.id", "=", id)
    .executeTakeFirst();
  if (!b) return null;
  const [parts, packages, requests] = await Promise.all([
    listBikeParts(db, id, { withRemoved: true }),
    db
      .selectFrom("packages as p")
      .leftJoin("users as u", "u.id", "p.builder_id")
      .leftJoin("keep_checks as k", "k.package_id", "p.id")
      .select(["p.id", "p.name", "p.status", "p.created_at", "u.name as builder", "k.checked_at"])
      .where("p.bike_id", "=", id)
      .orderBy("p.id", "desc")
      .execute(),
    db
      .selectFrom("build_requests")
      .select(["id", "created_at", "status"])
      .where("bike_id", "=", id)
      .execute(),
  ]);
  const history: { at: string; what: string }[] = [
    { at: iso(b.created_at), what: "Bike put on file" },
    ...requests.map((r) => ({
      at: iso(r.created_at),
      what: `Build request #${r.id} (${r.status.replace(/_/g, " ")})`,
    })),
    ...packages.map((p) => ({ at: iso(p.created_at), what: `Package “${p.name}” started` })),
    ...parts.flatMap((p) => [
      { at: p.fittedOn ? `${p.fittedOn}T00:00:00.000Z` : p.createdAt, what: `Fitted: ${p.label}` },
      ...(p.removedAt ? [{ at: p.removedAt, what: `Removed: ${p.label}` }] : []),
    ]),
  ].sort((x, y) => (x.at < y.at ? 1 : -1));
  return {
    id: b.id,
    customerId: b.customer_id,
    customer: b.customer,
    year: b.year,
    model: b.model,
    vin: b.vin,
    mileage: b.mileage,
    notes: b.notes,
    engineFamilyId: b.engine_family_id,
    family: b.family,
    parts: parts.filter((p) => !p.removedAt),
    packages: packages.map((p) => ({
      id: p.id,
      name: p.name,
      status: p.status,
      builder: p.builder,
      keepChecked: p.checked_at !== null,
    })),
    history,
  };
}

const iso = (t: unknown) => new Date(t as string).toISOString();

export type InstalledPart = {
  id: number;
  partId: number | null;
  partNumber: string | null;
  partName: string | null;
  category: string;
  categoryLabel: string;
  description: string;
  label: string;
  fittedOn: string | null;
  fittedMileage: number | null;
  notes: string;
  createdAt: string;
  removedAt: string | null;
};

export async function listBikeParts(
  db: Db,
  bikeId: number,
  opts: { withRemoved?: boolean } = {},
): Promise<InstalledPart[]> {
  let q = db
    .selectFrom("bike_parts as bp")
    .leftJoin("parts as p", "p.id", "bp.part_id")
    .innerJoin("part_categories as pc", "pc.slug", "bp.category")
    .select([
      "bp.id",
      "bp.part_id",
      "p.part_number",
      "p.name as part_name",
      "bp.category",
      "pc.label as category_label",
      "bp.description",
      sql<string | null>`to_char(bp.fitted_on, 'YYYY-MM-DD')`.as("fitted_on"),
      "bp.fitted_mileage",
      "bp.notes",
      "bp.created_at",
      "bp.removed_at",
    ])
    .where("bp.bike_id", "=", bikeId);
  if (!opts.withRemoved) q = q.where("bp.removed_at", "is", null);
  const rows = await q.orderBy("pc.sort").orderBy("bp.id").execute();
  return rows.map((r) => ({
    id: r.id,
    partId: r.part_id,
    partNumber: r.part_number,
    partName: r.part_name,
    category: r.category,
    categoryLabel: r.category_label,
    description: r.description,
    label: r.part_number ? `${r.part_number} ${r.part_name}` : r.description,
    fittedOn: r.fitted_on,
    fittedMileage: r.fitted_mileage,
    notes: r.notes,
    createdAt: iso(r.created_at),
    removedAt: r.removed_at ? iso(r.removed_at) : null,
  }));
}

export async function addBike(db: Db, customerId: number, input: BikeInput): Promise<number> {
  const row = await db
    .insertInto("bikes")
    .values({
      customer_id: customerId,
      year: input.year,
      model: input.model,
      vin: input.vin ?? null,
      engine_ci: null,
      mileage: input.mileage ?? null,
      notes: input.notes,
      engine_family_id: input.engineFamilyId ?? null,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateBike(db: Db, id: number, input: BikeInput) {
  await db
    .updateTable("bikes")
    .set({
      year: input.year,
      model: input.model,
      vin: input.vin ?? null,
      mileage: input.mileage ?? null,
      notes: input.notes,
      engine_family_id: input.engineFamilyId ?? null,
    })
    .where("id", "=", id)
    .execute();
}

/** A catalog part's category wins over the one picked; the description defaults to its name. */
async function partValues(db: Db, input: BikePartInput) {
  if (input.partId === undefined)
    return { part_id: null, category: input.category!, description: input.description! };
  const p = await db
    .selectFrom("parts")
    .select(["id", "category", "name"])
    .where("id", "=", input.partId)
    .executeTakeFirst();
  if (!p) return null;
  return { part_id: p.id, category: p.category, description: input.description ?? p.name };
}

export async function categoryExists(db: Db, slug: string) {
  return Boolean(
    await db
      .selectFrom("part_categories")
      .select("slug")
      .where("slug", "=", slug)
      .executeTakeFirst(),
  );
}

export async function addBikePart(
  db: Db,
  bikeId: number,
  input: BikePartInput,
  userId: number,
): Promise<number | null> {
  const v = await partValues(db, input);
  if (!v) return null;
  const row = await db
    .insertInto("bike_parts")
    .values({
      bike_id: bikeId,
      ...v,
      fitted_on: input.fittedOn ?? null,
      fitted_mileage: input.fittedMileage ?? null,
      notes: input.notes,
      created_by: userId,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateBikePart(
  db: Db,
  bikeId: number,
  partRowId: number,
  input: BikePartInput,
): Promise<boolean> {
  const v = await partValues(db, input);
  if (!v) return false;
  const res = await db
    .updateTable("bike_parts")
    .set({
      ...v,
      fitted_on: input.fittedOn ?? null,
      fitted_mileage: input.fittedMileage ?? null,
      notes: input.notes,
      updated_at: sql`now()`,
    })
    .where("id", "=", partRowId)
    .where("bike_id", "=", bikeId)
    .where("removed_at", "is", null)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function removeBikePart(db: Db, bikeId: number, partRowId: number, userId: number) {
  const res = await db
    .updateTable("bike_parts")
    .set({ removed_at: new Date(), removed_by: userId })
    .where("id", "=", partRowId)
    .where("bike_id", "=", bikeId)
    .where("removed_at", "is", null)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}
