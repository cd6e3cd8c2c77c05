// Customers: search (trigram indexes over name, e-mail, phone digits and VIN), one
// customer with bikes, packages and requests, edits, export (JSON, CSV) and erasure
// that keeps the packages for the shop's records, anonymised.
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { CustomerInput } from "./forms";

export async function searchCustomers(db: Db, raw: string, limit = 50) {
  const q = raw.trim().slice(0, 100);
  const lower = q.toLowerCase();
  const like = `%${lower.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  const digits = q.replace(/\D/g, "");
  let query = db
    .selectFrom("customers as c")
    .select(["c.id", "c.name", "c.email", "c.phone", "c.city"])
    .select((eb) =>
      eb
        .selectFrom("bikes as b")
        .select(sql<string>`string_agg(b.year || ' ' || b.model, ', ' order by b.id)`.as("x"))
        .whereRef("b.customer_id", "=", "c.id")
        .as("bikes"),
    )
    .where("c.erased_at", "is", null);
  if (q) {
    query = query
      .where((eb) =>
        eb.or([
          eb(sql`lower(c.name)`, "like", like),
          sql<boolean>`${lower} <% lower(c.name)`,
          eb(sql`lower(c.email)`, "like", like),
          ...(digits.length >= 3
            ? [
                eb(
                  sql`regexp_replace(coalesce(c.phone, ''), '[^0-9]', '', 'g')`,
                  "like",
                  `%${digits}%`,
                ),
              ]
            : []),
          eb.exists(
            eb
              .selectFrom("bikes as b")
              .select("b.id")
              .whereRef("b.customer_id", "=", "c.id")
              .where(sql`upper(b.vin)`, "like", like.toUpperCase()),
          ),
        ]),
      )
      .orderBy(sql`word_similarity(${lower}, lower(c.name))`, "desc");
  }
  return query.orderBy("c.name").limit(limit).execute();
}

export async function createCustomer(db: Db, input: CustomerInput): Promise<number> {
  const row = await db
    .insertInto("customers")
    .values({
      name: input.name,
      email: input.email ?? null,
      phone: input.phone ?? null,
      city: input.city ?? null,
      notes: input.notes,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateCustomer(db: Db, id: number, input: CustomerInput) {
  await db
    .updateTable("customers")
    .set({
      name: input.name,
      email: input.email ?? null,
      phone: input.phone ?? null,
      city: input.city ?? null,
      notes: input.notes,
    })
    .where("id", "=", id)
    .execute();
}

export async function getCustomer(db: Db, id: number) {
  const c = await db.selectFrom("customers").selectAll().where("id", "=", id).executeTakeFirst();
  if (!c) return null;
  const [bikes, packages, requests] = await Promise.all([
    db
      .selectFrom("bikes as b")
      .leftJoin("engine_families as f", "f.id", "b.engine_family_id")
      .select(["b.id", "b.year", "b.model", "b.vin", "b.mileage", "f.name as family"])
      .where("b.customer_id", "=", id)
      .orderBy("b.id")
      .execute(),
    db
      .selectFrom("packages as p")
      .innerJoin("bikes as b", "b.id", "p.bike_id")
      .select(["p.id", "p.name", "p.status", "p.updated_at", "b.year", "b.model"])
      .where("b.customer_id", "=", id)
      .orderBy("p.updated_at", "desc")
      .execute(),
    db
      .selectFrom("build_requests")
      .select(["id", "status", "bike_year", "bike_model", "created_at"])
      .where("customer_id", "=", id)
      .orderBy("id", "desc")
      .execute(),
  ]);
  return {
    id: c.id,
    name: c.name,
    email: c.email,
    phone: c.phone,
    city: c.city,
    notes: c.notes,
    erased: c.erased_at !== null,
    createdAt: new Date(c.created_at as unknown as Date).toISOString(),
    bikes,
    packages: packages.map((p) => ({
      id: p.id,
      name: p.name,
      status: p.status,
      bike: `${p.year} ${p.model}`,
      updatedAt: new Date(p.updated_at).toISOString(),
    })),
    requests: requests.map((r) => ({
      id: r.id,
      status: r.status,
      bike: `${r.bike_year} ${r.bike_model}`,
      createdAt: new Date(r.created_at).toISOString(),
    })),
  };
}

/** Everything the shop keeps about one customer, for an export. */
export async function exportCustomer(db: Db, id: number) {
  const c = await db.selectFrom("customers").selectAll().where("id", "=", id).executeTakeFirst();
  if (!c) return null;
  const bikes = await db.selectFrom("bikes").selectAll().where("customer_id", "=", id).execute();
  const bikeIds = bikes.map((b) => b.id);
  const [parts, requests, packages] = await Promise.all([
    bikeIds.length
      ? db
          .selectFrom("bike_parts as bp")
          .leftJoin("parts as p", "p.id", "bp.part_id")
          .select([
            "bp.id",
            "bp.bike_id",
            "bp.category",
            "bp.description",
            sql<string | null>`to_char(bp.fitted_on, 'YYYY-MM-DD')`.as("fitted_on"),
            "bp.fitted_mileage",
            "bp.notes",
            "bp.removed_at",
            "p.part_number",
          ])
          .where("bp.bike_id", "in", bikeIds)
          .orderBy("bp.id")
          .execute()
      : [],
    db.selectFrom("build_requests").selectAll().where("customer_id", "=", id).execute(),
    bikeIds.length
      ? db
          .selectFrom("packages")
          .select(["id", "bike_id", "name", "status", "created_at"])
          .where("bike_id", "in", bikeIds)
          .execute()
      : [],
  ]);
  const requestIds = requests.map((r) => r.id);
  const notes = requestIds.length
    ? await db
        .selectFrom("build_request_notes")
        .select(["request_id", "body", "created_at"])
        .where("request_id", "in", requestIds)
        .orderBy("id")
        .execute()
    : [];
  return {
    exportedAt: new Date().toISOString(),
    customer: {
      id: c.id,
      name: c.name,
      email: c.email,
      phone: c.phone,
      city: c.city,
      notes: c.notes,
      createdAt: new Date(c.created_at as unknown as Date).toISOString(),
    },
    bikes: bikes.map((b) => ({
      id: b.id,
      year: b.year,
      model: b.model,
      vin: b.vin,
      mileage: b.mileage,
      notes: b.notes,
      installedParts: parts
        .filter((p) => p.bike_id === b.id)
        .map((p) => ({
          id: p.id,
          category: p.category,
          partNumber: p.part_number,
          description: p.description,
          fittedOn: p.fitted_on,
          fittedMileage: p.fitted_mileage,
          notes: p.notes,
          removed: p.removed_at !== null,
        })),
    })),
    requests: requests.map((r) => ({
      id: r.id,
      status: r.status,
      createdAt: new Date(r.created_at).toISOString(),
      name: r.name,
      email: r.email,
      phone: r.phone,
      bike: `${r.bike_year} ${r.bike_model}`,
      mileage: r.mileage,
      currentParts: r.current_parts,
      goals: r.goals,
      riding: r.riding,
      budget: r.budget,
      timeFrame: r.time_frame,
      contactBy: r.contact_by,
      notes: notes.filter((n) => n.request_id === r.id).map((n) => n.body),
    })),
    packages: packages.map((p) => ({
      id: p.id,
      bikeId: p.bike_id,
      name: p.name,
      status: p.status,
      createdAt: new Date(p.created_at).toISOString(),
    })),
  };
}

export type CustomerExport = NonNullable<Awaited<ReturnType<typeof exportCustomer>>>;

function cell(v: unknown): string {
  let s = v === null || v === undefined ? "" : Array.isArray(v) ? v.join("; ") : String(v);
  // a spreadsheet would run a cell that starts like a formula
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The export as CSV: one row per field, `record, id, field, value`. */
export function exportCsv(x: CustomerExport): string {
  const rows: unknown[][] = [["record", "id", "field", "value"]];
  const add = (record: string, id: number, obj: Record<string, unknown>) => {
    for (const [k, v] of Object.entries(obj))
      if (typeof v !== "object" || v === null || Array.isArray(v)) rows.push([record, id, k, v]);
  };
  add("customer", x.customer.id, x.customer);
  for (const b of x.bikes) {
    add("bike", b.id, b);
    for (const p of b.installedParts) add("installed part", p.id, { bikeId: b.id, ...p });
  }
  for (const r of x.requests) add("build request", r.id, r);
  for (const p of x.packages) add("package", p.id, p);
  return `${rows.map((r) => r.map(cell).join(",")).join("\r\n")}\r\n`;
}

/**
 * Erases a customer's personal data. The customer and bike rows stay (anonymised) so
 * the packages keep their place in the shop's records; requests lose the rider's words
 * and contact, their notes go, and sent mail to the address is blanked.
 */
export async function eraseCustomer(db: Db, id: number): Promise<boolean> {
  return db.transaction().execute(async (trx) => {
    const c = await trx
      .selectFrom("customers")
      .select(["id", "email"])
      .where("id", "=", id)
      .forUpdate()
      .executeTakeFirst();
    if (!c) return false;
    const email = c.email?.toLowerCase() ?? null;
    await trx
      .updateTable("customers")
      .set({
        name: `Erased customer #${id}`,
        email: null,
        phone: null,
        city: null,
        notes: "",
        erased_at: new Date(),
      })
      .where("id", "=", id)
      .execute();
    await trx
      .updateTable("bikes")
      .set({ vin: null, notes: "", erased_at: new Date() })
      .where("customer_id", "=", id)
      .execute();
    const requests = await trx
      .selectFrom("build_requests")
      .select("id")
      .where((eb) =>
        eb.or([eb("customer_id", "=", id), ...(email ? [eb(sql`lower(email)`, "=", email)] : [])]),
      )
      .execute();
    const ids = requests.map((r) => r.id);
    if (ids.length) {
      await trx.deleteFrom("build_request_notes").where("request_id", "in", ids).execute();
      await trx
        .updateTable("build_requests")
        .set({
          name: `Erased customer #${id}`,
          email: "",
          phone: null,
          goals: "",
          current_parts: "[]",
          bike_model: "",
          client_address: "",
        })
        .where("id", "in", ids)
        .execute();
    }
    if (email)
      await trx
        .updateTable("mail_messages")
        .set({ to_address: "erased", subject: "(erased)", text_body: "", html_body: null })
        .where(sql`lower(to_address)`, "=", email)
        .where("status", "=", "sent")
        .execute();
    return true;
  });
}
