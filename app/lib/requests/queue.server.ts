// The service writer's queue of build requests: list, one request with its history and
// notes, status changes, notes, and convert (customer + bike + installed parts + a
// draft package, in one transaction).
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { RequestStatus } from "../../../db/schema/requests";
import { createPackage } from "../packages/store.server";
import { startingSpecForBike } from "../packages/from-bike.server";
import { TIME_FRAMES } from "./options";
import type { ConvertInput } from "./convert-form";

/** Which status may follow which; `converted` only through convert, and it is final. */
export const REQUEST_TRANSITIONS: Record<RequestStatus, RequestStatus[]> = {
  new: ["contacted", "waiting_on_rider", "declined"],
  contacted: ["waiting_on_rider", "declined", "new"],
  waiting_on_rider: ["contacted", "declined"],
  declined: ["contacted"],
  converted: [],
};

const TIME_RANK = sql<number>`case r.time_frame ${sql.join(
  TIME_FRAMES.map((t) => sql`when ${t.value} then ${t.rank}`),
  sql` `,
)} else 9 end`;

export type RequestSort = "age" | "time_frame";

export async function listRequests(
  db: Db,
  opts: { status?: RequestStatus | "open" | null; sort?: RequestSort; dir?: "asc" | "desc" },
) {
  let q = db
    .selectFrom("build_requests as r")
    .leftJoin("engine_families as f", "f.id", "r.engine_family_id")
    .select([
      "r.id",
      "r.name",
      "r.bike_year",
      "r.bike_model",
      "r.status",
      "r.time_frame",
      "r.budget",
      "r.created_at",
      "r.updated_at",
      "f.name as family",
    ])
    .select((eb) =>
      eb
        .selectFrom("build_request_status_changes as s")
        .leftJoin("users as u", "u.id", "s.changed_by")
        .select(sql<string>`coalesce(u.name, 'the rider')`.as("n"))
        .whereRef("s.request_id", "=", "r.id")
        .orderBy("s.id", "desc")
        .limit(1)
        .as("changed_by"),
    );
  if (opts.status === "open")
    q = q.where("r.status", "in", ["new", "contacted", "waiting_on_rider"]);
  else if (opts.status) q = q.where("r.status", "=", opts.status);
  const sort = opts.sort ?? "age";
  // age: the oldest first (it has waited longest); time frame: the most urgent first
  const dir = opts.dir ?? "asc";
  q =
    sort === "time_frame"
      ? q.orderBy(TIME_RANK, dir).orderBy("r.created_at", "asc")
      : q.orderBy("r.created_at", dir);
  const rows = await q.orderBy("r.id").limit(200).execute();
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    bike: `${r.bike_year} ${r.bike_model}`,
    family: r.family,
    status: r.status,
    timeFrame: r.time_frame,
    budget: r.budget,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
    changedBy: r.changed_by,
  }));
}

export async function getRequest(db: Db, id: number) {
  const r = await db
    .selectFrom("build_requests as r")
    .leftJoin("engine_families as f", "f.id", "r.engine_family_id")
    .selectAll("r")
    .select("f.name as family")
    .where("r.id", "=", id)
    .executeTakeFirst();
  if (!r) return null;
  const [history, notes] = await Promise.all([
    db
      .selectFrom("build_request_status_changes as s")
      .leftJoin("users as u", "u.id", "s.changed_by")
      .select(["s.from_status", "s.to_status", "s.changed_at", "u.name"])
      .where("s.request_id", "=", id)
      .orderBy("s.id", "desc")
      .execute(),
    db
      .selectFrom("build_request_notes as n")
      .leftJoin("users as u", "u.id", "n.author_id")
      .select(["n.id", "n.body", "n.created_at", "u.name"])
      .where("n.request_id", "=", id)
      .orderBy("n.id", "desc")
      .execute(),
  ]);
  return {
    id: r.id,
    name: r.name,
    email: r.email,
    phone: r.phone,
    bikeYear: r.bike_year,
    bikeModel: r.bike_model,
    engineFamilyId: r.engine_family_id,
    family: r.family,
    mileage: r.mileage,
    currentParts: r.current_parts,
    goals: r.goals,
    riding: r.riding,
    budget: r.budget,
    timeFrame: r.time_frame,
    contactBy: r.contact_by,
    status: r.status,
    customerId: r.customer_id,
    bikeId: r.bike_id,
    packageId: r.package_id,
    createdAt: new Date(r.created_at).toISOString(),
    history: history.map((h) => ({
      from: h.from_status,
      to: h.to_status,
      at: new Date(h.changed_at).toISOString(),
      by: h.name ?? (h.from_status === null ? "the rider (form)" : null),
    })),
    notes: notes.map((n) => ({
      id: n.id,
      body: n.body,
      at: new Date(n.created_at).toISOString(),
      by: n.name,
    })),
  };
}

export type RequestDetail = NonNullable<Awaited<ReturnType<typeof getRequest>>>;

export async function changeRequestStatus(
  db: Db,
  id: number,
  to: RequestStatus,
  userId: number,
): Promise<{ ok: true } | { ok: false; message: string }> {
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .selectFrom("build_requests")
      .select("status")
      .where("id", "=", id)
      .forUpdate()
      .executeTakeFirst();
    if (!row) return { ok: false as const, message: "This request no longer exists." };
    if (!REQUEST_TRANSITIONS[row.status].includes(to))
      return {
        ok: false as const,
        message:
          to === "converted"
            ? "Use Convert to turn a request into a customer, bike and package."
            : `A request that is ${row.status.replace(/_/g, " ")} cannot move to ${to.replace(/_/g, " ")}.`,
      };
    await trx
      .updateTable("build_requests")
      .set({ status: to, updated_at: sql`now()` })
      .where("id", "=", id)
      .execute();
    await trx
      .insertInto("build_request_status_changes")
      .values({ request_id: id, from_status: row.status, to_status: to, changed_by: userId })
      .execute();
    return { ok: true as const };
  });
}

export async function addRequestNote(db: Db, id: number, body: string, userId: number) {
  await db.transaction().execute(async (trx) => {
    await trx
      .insertInto("build_request_notes")
      .values({ request_id: id, body, author_id: userId })
      .execute();
    await trx
      .updateTable("build_requests")
      .set({ updated_at: sql`now()` })
      .where("id", "=", id)
      .execute();
  });
}

export const digitsOf = (phone: string | null | undefined) => (phone ?? "").replace(/\D/g, "");

/** Customers on file with the request's e-mail or phone (shown for confirmation, never merged). */
export async function findMatches(db: Db, email: string, phone: string | null) {
  const digits = digitsOf(phone);
  const rows = await db
    .selectFrom("customers as c")
    .select(["c.id", "c.name", "c.email", "c.phone", "c.city"])
    .where("c.erased_at", "is", null)
    .where((eb) =>
      eb.or([
        eb(sql`lower(c.email)`, "=", email.trim().toLowerCase()),
        ...(digits.length >= 7
          ? [eb(sql`regexp_replace(coalesce(c.phone, ''), '[^0-9]', '', 'g')`, "=", digits)]
          : []),
      ]),
    )
    .orderBy("c.id")
    .execute();
  const bikes = rows.length
    ? await db
        .selectFrom("bikes")
        .select(["id", "customer_id", "year", "model", "vin"])
        .where(
          "customer_id",
          "in",
          rows.map((r) => r.id),
        )
        .orderBy("id")
        .execute()
    : [];
  return rows.map((r) => ({
    ...r,
    by:
      r.email && r.email.toLowerCase() === email.trim().toLowerCase()
        ? ("email" as const)
        : ("phone" as const),
    bikes: bikes
      .filter((b) => b.customer_id === r.id)
      .map((b) => ({ id: b.id, label: `${b.year} ${b.model}`, vin: b.vin })),
  }));
}

export type ConvertOutcome =
  | { ok: true; customerId: number; bikeId: number; packageId: number }
  | { ok: false; field: string; message: string };

export async function convertRequest(
  db: Db,
  requestId: number,
  input: ConvertInput,
  userId: number,
): Promise<ConvertOutcome> {
  const req = await getRequest(db, requestId);
  if (!req) return { ok: false, field: "", message: "This request no longer exists." };
  if (req.status === "converted")
    return { ok: false, field: "", message: "This request was already converted." };
  const matches = await findMatches(db, req.email, req.phone);
  if (input.customer === "new" && matches.length > 0 && !input.confirmNew)
    return {
      ok: false,
      field: "confirmNew",
      message: `${matches.map((m) => m.name).join(", ")} ${matches.length === 1 ? "is" : "are"} on file with this ${matches[0]!.by === "email" ? "e-mail" : "phone"}. Link the request to them, or tick the box to create a second customer.`,
    };
  const linked =
    input.customer === "new" ? null : matches.find((m) => m.id === Number(input.customer));
  if (input.customer !== "new" && !linked)
    return { ok: false, field: "customer", message: "Pick one of the customers shown" };
  if (input.bike !== "new" && !linked?.bikes.some((b) => b.id === Number(input.bike)))
    return { ok: false, field: "bike", message: "Pick one of this customer's bikes" };
  const builder = await db
    .selectFrom("users")
    .select("id")
    .where("id", "=", input.builderId)
    .where("role", "in", ["builder", "owner"])
    .where("disabled_at", "is", null)
    .executeTakeFirst();
  if (!builder)
    return { ok: false, field: "builderId", message: "Pick one of the shop's builders" };
  const partIds = input.parts.filter((p) => p.include && p.partId).map((p) => p.partId!);
  const known = partIds.length
    ? await db.selectFrom("parts").select(["id", "category"]).where("id", "in", partIds).execute()
    : [];
  const categoryOf = new Map(known.map((p) => [p.id, p.category]));
  const categories = new Set(
    (await db.selectFrom("part_categories").select("slug").execute()).map((c) => c.slug),
  );
  for (const [i, p] of input.parts.entries()) {
    if (!p.include) continue;
    if (p.partId && !categoryOf.has(p.partId))
      return { ok: false, field: `parts[${i}].partId`, message: "That part is not in the catalog" };
    if (!p.partId && !categories.has(p.category ?? ""))
      return { ok: false, field: `parts[${i}].category`, message: "Pick a category from the list" };
  }
  const familyId = input.engineFamilyId ?? req.engineFamilyId;

  return db.transaction().execute(async (trx) => {
    // the row lock keeps two tabs from converting the same request twice
    const locked = await trx
      .selectFrom("build_requests")
      .select("status")
      .where("id", "=", requestId)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (locked.status === "converted")
      return { ok: false as const, field: "", message: "This request was already converted." };
    const customerId =
      linked?.id ??
      (
        await trx
          .insertInto("customers")
          .values({
            name: req.name,
            email: req.email,
            phone: req.phone,
            city: null,
            notes: "",
          })
          .returning("id")
          .executeTakeFirstOrThrow()
      ).id;
    let bikeId: number;
    if (input.bike === "new") {
      bikeId = (
        await trx
          .insertInto("bikes")
          .values({
            customer_id: customerId,
            year: req.bikeYear,
            model: req.bikeModel,
            vin: input.vin ?? null,
            engine_ci: null,
            mileage: req.mileage,
            notes: "",
            engine_family_id: familyId,
          })
          .returning("id")
          .executeTakeFirstOrThrow()
      ).id;
    } else {
      bikeId = Number(input.bike);
      await trx
        .updateTable("bikes")
        .set({
          ...(req.mileage !== null ? { mileage: req.mileage } : {}),
          ...(familyId ? { engine_family_id: familyId } : {}),
        })
        .where("id", "=", bikeId)
        .execute();
    }
    for (const p of input.parts) {
      if (!p.include) continue;
      await trx
        .insertInto("bike_parts")
        .values({
          bike_id: bikeId,
          part_id: p.partId ?? null,
          category: p.partId ? categoryOf.get(p.partId)! : p.category!,
          description: p.description,
          created_by: userId,
          notes: `From build request #${requestId}`,
        })
        .execute();
    }
    const spec = await startingSpecForBike(trx, bikeId);
    const packageId = await createPackage(
      trx,
      {
        name: input.packageName,
        bikeId,
        isTemplate: false,
        builderId: input.builderId,
        spec,
        notes: `From build request #${requestId}: ${req.goals}`.slice(0, 2000),
        change: `Started from the bike's parts (build request #${requestId})`,
      },
      userId,
    );
    await trx
      .updateTable("build_requests")
      .set({
        status: "converted",
        customer_id: customerId,
        bike_id: bikeId,
        package_id: packageId,
        updated_at: sql`now()`,
      })
      .where("id", "=", requestId)
      .execute();
    await trx
      .insertInto("build_request_status_changes")
      .values({
        request_id: requestId,
        from_status: locked.status,
        to_status: "converted",
        changed_by: userId,
      })
      .execute();
    return { ok: true as const, customerId, bikeId, packageId };
  });
}

/** The builders (and the owner) a draft package can go to. */
export async function builderOptions(db: Db) {
  return db
    .selectFrom("users")
    .select(["id", "name", "role"])
    .where("role", "in", ["builder", "owner"])
    .where("disabled_at", "is", null)
    .orderBy("role")
    .orderBy("name")
    .execute();
}
