// The parts catalog: categories, parts and their version history.
import { sql, type Kysely, type Transaction } from "kysely";
import type { Database, Part } from "../../../db/schema";
import { cleanAttributes, type PartInput } from "./attributes";
import { BUILT_IN_CATEGORIES } from "../packages/slots";

type Db = Kysely<Database> | Transaction<Database>;

/** Inserts the built-in categories that are missing (the seed and the test fixtures call it). */
export async function ensureBuiltInCategories(db: Db): Promise<void> {
  await db
    .insertInto("part_categories")
    .values(
      BUILT_IN_CATEGORIES.map((c, i) => ({
        slug: c.slug,
        label: c.label,
        sort: (i + 1) * 10,
        built_in: true,
      })),
    )
    .onConflict((oc) => oc.column("slug").doNothing())
    .execute();
}

export async function listCategories(db: Db) {
  return db.selectFrom("part_categories").selectAll().orderBy("sort").orderBy("label").execute();
}

/** The categories as a form's options (built-in ones carry measurements). */
export async function categoryOptions(
  db: Db,
): Promise<{ value: string; label: string; builtIn: boolean }[]> {
  return (await listCategories(db)).map((c) => ({
    value: c.slug,
    label: c.label,
    builtIn: c.built_in,
  }));
}

export function slugFor(label: string): string {
  return label
    .trim()
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "")
    .slice(0, 40);
}

export async function addCategory(
  db: Db,
  label: string,
): Promise<{ slug: string } | { error: string }> {
  const slug = slugFor(label);
  if (!slug) return { error: "Use letters or digits in the name" };
  const row = await db
    .insertInto("part_categories")
    .values({ slug, label: label.trim(), sort: 500, built_in: false })
    .onConflict((oc) => oc.column("slug").doNothing())
    .returning("slug")
    .executeTakeFirst();
  return row ? { slug } : { error: `A category called "${slug}" already exists` };
}

export const PART_SORTS = ["part_number", "name", "maker", "category", "price", "updated"] as const;
export type PartSort = (typeof PART_SORTS)[number];
const SORT_COLUMN = {
  part_number: "part_number",
  name: "name",
  maker: "maker",
  category: "category",
  price: "price_cents",
  updated: "updated_at",
} as const;

export type PartSearch = {
  q?: string;
  category?: string;
  archived?: boolean;
  sort?: PartSort;
  dir?: "asc" | "desc";
  page?: number;
  perPage?: number;
};

/** The shelf search: by part number, name, maker or tag; archived parts only when asked. */
export async function searchParts(db: Db, s: PartSearch) {
  const perPage = Math.min(Math.max(s.perPage ?? 25, 1), 200);
  const page = Math.max(s.page ?? 1, 1);
  let q = db.selectFrom("parts");
  if (!s.archived) q = q.where("archived_at", "is", null);
  if (s.category) q = q.where("category", "=", s.category);
  const text = s.q?.trim().toLowerCase();
  if (text) {
    const like = `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q = q.where((eb) =>
      eb.or([
        eb(eb.fn("lower", ["part_number"]), "like", like),
        eb(eb.fn("lower", ["name"]), "like", like),
        eb(eb.fn("lower", ["maker"]), "like", like),
        eb(sql<string>`array_to_string(tags, ' ')`, "like", like),
      ]),
    );
  }
  const total = Number(
    (await q.select((eb) => eb.fn.countAll<string>().as("n")).executeTakeFirstOrThrow()).n,
  );
  const col = SORT_COLUMN[s.sort ?? "part_number"] ?? "part_number";
  const rows = await q
    .selectAll()
    .orderBy(col, s.dir === "desc" ? "desc" : "asc")
    .orderBy("id")
    .limit(perPage)
    .offset((page - 1) * perPage)
    .execute();
  return { rows, total, page, perPage, pages: Math.max(1, Math.ceil(total / perPage)) };
}

export async function getPart(db: Db, id: number): Promise<Part | undefined> {
  if (!Number.isSafeInteger(id) || id <= 0) return undefined;
  return db.selectFrom("parts").selectAll().where("id", "=", id).executeTakeFirst();
}

export async function getPartByNumber(db: Db, partNumber: string): Promise<Part | undefined> {
  return db
    .selectFrom("parts")
    .selectAll()
    .where((eb) => eb(eb.fn("lower", ["part_number"]), "=", partNumber.toLowerCase()))
    .executeTakeFirst();
}

export async function getPartHistory(db: Db, id: number) {
  return db
    .selectFrom("part_versions")
    .leftJoin("users", "users.id", "part_versions.changed_by")
    .select([
      "part_versions.version",
      "part_versions.snapshot",
      "part_versions.change",
      "part_versions.changed_at",
      "users.name as changed_by_name",
    ])
    .where("part_id", "=", id)
    .orderBy("version", "desc")
    .execute();
}

function rowValues(input: PartInput) {
  return {
    part_number: input.part_number,
    category: input.category,
    maker: input.maker,
    name: input.name,
    price_cents: Math.round(input.price * 100),
    labour_hours: Math.round(input.labour_hours * 100) / 100,
    tags: input.tags,
    stock: input.stock,
    attributes: JSON.stringify(cleanAttributes(input.attributes)),
    notes: input.notes,
  };
}

function snapshotOf(p: Part) {
  return {
    part_number: p.part_number,
    category: p.category,
    maker: p.maker,
    name: p.name,
    price_cents: p.price_cents,
    labour_hours: Number(p.labour_hours),
    tags: p.tags,
    stock: p.stock,
    attributes: p.attributes,
    notes: p.notes,
    archived: p.archived_at !== null,
  };
}

const FIELD_WORDS: Record<string, string> = {
  part_number: "part number",
  labour_hours: "labour hours",
  price_cents: "price",
};

function describeChange(before: Part, after: Part): string {
  const a = snapshotOf(before) as Record<string, unknown>;
  const b = snapshotOf(after) as Record<string, unknown>;
  const changed = Object.keys(b).filter((k) => JSON.stringify(a[k]) !== JSON.stringify(b[k]));
  return changed.length
    ? `Changed ${changed.map((k) => FIELD_WORDS[k] ?? k).join(", ")}`
    : "Saved without changes";
}

async function writeVersion(db: Db, part: Part, change: string, userId: number | null) {
  await db
    .insertInto("part_versions")
    .values({
      part_id: part.id,
      version: part.version,
      snapshot: JSON.stringify(snapshotOf(part)),
      change,
      changed_by: userId,
    })
    .execute();
}

export async function createPart(
  db: Db,
  input: PartInput,
  userId: number | null,
  change = "Created",
): Promise<Part> {
  const part = await db
    .insertInto("parts")
    .values({ ...rowValues(input), updated_by: userId })
    .returningAll()
    .executeTakeFirstOrThrow();
  await writeVersion(db, part, change, userId);
  return part;
}

/** Saves a new version of a part; null when someone else saved it first (version moved on). */
export async function updatePart(
  db: Db,
  id: number,
  input: PartInput,
  expectedVersion: number | null,
  userId: number | null,
  change?: string,
): Promise<Part | null> {
  const before = await db
    .selectFrom("parts")
    .selectAll()
    .where("id", "=", id)
    .forUpdate()
    .executeTakeFirst();
  if (!before || (expectedVersion !== null && before.version !== expectedVersion)) return null;
  const after = await db
    .updateTable("parts")
    .set({
      ...rowValues(input),
      version: before.version + 1,
      updated_at: sql`now()`,
      updated_by: userId,
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow();
  await writeVersion(db, after, change ?? describeChange(before, after), userId);
  return after;
}

/** Archives (or restores) a part: packages that used it keep showing it. */
export async function setArchived(
  db: Db,
  id: number,
  archived: boolean,
  userId: number | null,
): Promise<Part | null> {
  const before = await db
    .selectFrom("parts")
    .selectAll()
    .where("id", "=", id)
    .forUpdate()
    .executeTakeFirst();
  if (!before || (before.archived_at !== null) === archived) return before ?? null;
  const after = await db
    .updateTable("parts")
    .set({
      archived_at: archived ? new Date() : null,
      version: before.version + 1,
      updated_at: sql`now()`,
      updated_by: userId,
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow();
  await writeVersion(db, after, archived ? "Archived" : "Restored from the archive", userId);
  return after;
}

/** A part as a role may see it: apprentices never receive prices. */
export function partForRole<T extends { price_cents: number }>(
  part: T,
  showPrices: boolean,
): Omit<T, "price_cents"> & { price_cents: number | null } {
  if (showPrices) return part;
  const { price_cents: _hidden, ...rest } = part;
  return { ...rest, price_cents: null };
}
