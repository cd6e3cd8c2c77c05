// Engine families: the shop's record of each engine it works on. Every save is a
// version (snapshot + one line saying what changed), like parts.
import { sql } from "kysely";
import type { Db } from "../db.server";
import { SLOTS, SLOT_BY_KEY } from "../packages/slots";
import type { FamilyInput } from "./family";

export interface EngineFamily {
  id: number;
  name: string;
  yearFrom: number;
  yearTo: number | null;
  boreMm: number;
  strokeMm: number;
  displacementCc: number;
  deckHeightMm: number | null;
  revLimitRpm: number | null;
  stockParts: Record<string, number>;
  notes: string;
  version: number;
  archived: boolean;
}

type Row = {
  id: number;
  name: string;
  year_from: number;
  year_to: number | null;
  stock_bore_mm: number;
  stock_stroke_mm: number;
  displacement_cc: number;
  deck_height_mm: number | null;
  stock_rev_limit_rpm: number | null;
  stock_parts: Record<string, number>;
  notes: string;
  version: number;
  archived_at: Date | null;
};

function toFamily(r: Row): EngineFamily {
  return {
    id: r.id,
    name: r.name,
    yearFrom: r.year_from,
    yearTo: r.year_to,
    boreMm: Number(r.stock_bore_mm),
    strokeMm: Number(r.stock_stroke_mm),
    displacementCc: Number(r.displacement_cc),
    deckHeightMm: r.deck_height_mm === null ? null : Number(r.deck_height_mm),
    revLimitRpm: r.stock_rev_limit_rpm,
    stockParts: r.stock_parts ?? {},
    notes: r.notes,
    version: r.version,
    archived: r.archived_at !== null,
  };
}

export async function listFamilies(db: Db, opts: { includeArchived?: boolean } = {}) {
  let q = db.selectFrom("engine_families").selectAll();
  if (!opts.includeArchived) q = q.where("archived_at", "is", null);
  const rows = (await q.orderBy("year_from").orderBy("name").execute()) as Row[];
  return rows.map(toFamily);
}

export async function getFamily(db: Db, id: number): Promise<EngineFamily | null> {
  const r = await db
    .selectFrom("engine_families")
    .selectAll()
    .where("id", "=", id)
    .executeTakeFirst();
  return r ? toFamily(r as Row) : null;
}

/** The stock part of each slot, from the form's `stock_<slot>` fields. */
function stockPartsOf(input: FamilyInput): Record<string, number> {
  const out: Record<string, number> = {};
  const fields = input as unknown as Record<string, unknown>;
  for (const s of SLOTS) {
    const v = fields[`stock_${s.key}`];
    if (typeof v === "number") out[s.key] = v;
  }
  return out;
}

/** Stock parts must be catalog parts of their slot's category. */
export async function checkStockParts(
  db: Db,
  input: FamilyInput,
): Promise<Record<string, string[]>> {
  const wanted = stockPartsOf(input);
  const ids = Object.values(wanted);
  if (ids.length === 0) return {};
  const rows = await db
    .selectFrom("parts")
    .select(["id", "category"])
    .where("id", "in", ids)
    .execute();
  const byId = new Map(rows.map((r) => [r.id, r.category]));
  const errors: Record<string, string[]> = {};
  for (const [slot, id] of Object.entries(wanted)) {
    const cat = byId.get(id);
    if (cat !== SLOT_BY_KEY[slot]?.category)
      errors[`stock_${slot}`] = [
        `Pick a ${SLOT_BY_KEY[slot]?.label.toLowerCase()} part from the catalog`,
      ];
  }
  return errors;
}

function values(input: FamilyInput) {
  return {
    name: input.name,
    year_from: input.yearFrom,
    year_to: input.yearTo ?? null,
    stock_bore_mm: input.boreMm,
    stock_stroke_mm: input.strokeMm,
    displacement_cc: input.displacementCc,
    deck_height_mm: input.deckHeightMm ?? null,
    stock_rev_limit_rpm: input.revLimitRpm ?? null,
    stock_parts: JSON.stringify(stockPartsOf(input)),
    notes: input.notes ?? "",
  };
}

export class DuplicateFamilyName extends Error {}

async function guardName(db: Db, name: string, id?: number) {
  let q = db
    .selectFrom("engine_families")
    .select("id")
    .where(sql`lower(name)`, "=", name.toLowerCase());
  if (id) q = q.where("id", "!=", id);
  if (await q.executeTakeFirst()) throw new DuplicateFamilyName(name);
}

export async function createFamily(
  db: Db,
  input: FamilyInput,
  userId: number | null,
  change = "Added",
): Promise<number> {
  await guardName(db, input.name);
  const row = await db
    .insertInto("engine_families")
    .values({ ...values(input), updated_by: userId })
    .returningAll()
    .executeTakeFirstOrThrow();
  await db
    .insertInto("engine_family_versions")
    .values({
      family_id: row.id,
      version: 1,
      snapshot: JSON.stringify(toFamily(row as Row)),
      change,
      changed_by: userId,
    })
    .execute();
  return row.id;
}

export async function updateFamily(
  db: Db,
  id: number,
  input: FamilyInput,
  userId: number,
  opts: { archive?: boolean } = {},
): Promise<EngineFamily | null> {
  const before = await getFamily(db, id);
  if (!before) return null;
  await guardName(db, input.name, id);
  const row = await db
    .updateTable("engine_families")
    .set({
      ...values(input),
      version: before.version + 1,
      updated_at: sql`now()`,
      updated_by: userId,
      ...(opts.archive === undefined ? {} : { archived_at: opts.archive ? new Date() : null }),
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow();
  const after = toFamily(row as Row);
  await db
    .insertInto("engine_family_versions")
    .values({
      family_id: id,
      version: after.version,
      snapshot: JSON.stringify(after),
      change: describeChange(before, after),
      changed_by: userId,
    })
    .execute();
  return after;
}

const LABELS: [keyof EngineFamily, string][] = [
  ["name", "name"],
  ["yearFrom", "first year"],
  ["yearTo", "last year"],
  ["boreMm", "stock bore"],
  ["strokeMm", "stock stroke"],
  ["displacementCc", "displacement"],
  ["deckHeightMm", "case deck height"],
  ["revLimitRpm", "stock rev limit"],
  ["notes", "notes"],
  ["archived", "archived"],
];

export function describeChange(a: EngineFamily, b: EngineFamily): string {
  const changed = LABELS.filter(([k]) => a[k] !== b[k]).map(([, l]) => l);
  for (const s of SLOTS)
    if ((a.stockParts[s.key] ?? null) !== (b.stockParts[s.key] ?? null))
      changed.push(`stock ${s.label.toLowerCase()}`);
  if (b.archived && !a.archived) return "Archived";
  if (!b.archived && a.archived) return "Restored";
  return changed.length ? `Changed ${changed.join(", ")}` : "Saved without changes";
}

export async function familyHistory(db: Db, id: number) {
  const rows = await db
    .selectFrom("engine_family_versions as v")
    .leftJoin("users as u", "u.id", "v.changed_by")
    .select(["v.version", "v.change", "v.changed_at", "u.name"])
    .where("v.family_id", "=", id)
    .orderBy("v.version", "desc")
    .execute();
  return rows.map((r) => ({
    version: r.version,
    change: r.change,
    at: new Date(r.changed_at).toISOString(),
    by: r.name,
  }));
}
