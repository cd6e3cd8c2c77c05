// The request queue: listing, status history with who and when, notes, and convert —
// a new customer, bike, installed parts and a draft package started from the engine
// family's stock parts with the installed ones in their slots; and, when the e-mail
// matches a customer on file, no second customer without the service writer's say.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createFamily } from "~/lib/engine-families/families.server";
import type { FamilyInput } from "~/lib/engine-families/family";
import { createBuildRequest } from "~/lib/requests/intake.server";
import { BuildRequestSchema } from "~/lib/requests/request-form";
import { normaliseSpec } from "~/lib/bench/spec";
import * as list from "~/routes/requests";
import * as one from "~/routes/requests.$id";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";
import { ensureShop, riderFields, tagOf } from "../support/requests";

const db = getDb();
const tag = tagOf();
let writer: TestUser;
let builder: TestUser;
let apprentice: TestUser;
let familyId = 0;
const part: Record<string, number> = {};

async function addPart(key: string, category: string, attributes: Record<string, number>) {
  part[key] = (
    await db
      .insertInto("parts")
      .values({
        part_number: `RQ-${tag}-${key}`,
        category,
        maker: "Test Works",
        name: `Request test ${key}`,
        price_cents: 100,
        tags: [],
        stock: key.startsWith("stock"),
        attributes: JSON.stringify(attributes),
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
}

async function newRequest(over: Record<string, string> = {}) {
  const parsed = BuildRequestSchema.parse({
    ...riderFields(tagOf(), {
      engineFamily: String(familyId),
      phone: `555-${String(Math.floor(Math.random() * 1e7)).padStart(7, "0")}`,
      ...over,
    }),
    riding: ["two_up"],
  });
  return createBuildRequest(db, parsed, "10.9.9.9");
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  await ensureShop(db);
  [writer, builder, apprentice] = await Promise.all([
    createTestUser(db, "service_writer"),
    createTestUser(db, "builder"),
    createTestUser(db, "apprentice"),
  ]);
  await addPart("stockCyl", "cylinders", { boreMm: 101.6 });
  await addPart("stockFly", "flywheels", { strokeMm: 114.3 });
  await addPart("stockAxle", "axle_adjusters", {});
  await addPart("shocks", "rear_shocks", {});
  familyId = await createFamily(
    db,
    {
      name: `Test twin ${tag}`,
      yearFrom: 2017,
      yearTo: 2023,
      boreMm: 101.6,
      strokeMm: 114.3,
      displacementCc: 1853,
      revLimitRpm: 5600,
      stock_cylinder: part.stockCyl,
      stock_flywheel: part.stockFly,
      stock_axle_adjusters: part.stockAxle,
    } as unknown as FamilyInput,
    null,
  );
});

const convertBody = (over: Record<string, string> = {}) => ({
  intent: "convert",
  customer: "new",
  bike: "new",
  vin: "9tw1lh22xnd00abcd".replace("abcd", "0042"),
  engineFamilyId: String(familyId),
  builderId: String(builder.id),
  packageName: "Passing power",
  "parts[0].include": "on",
  "parts[0].description": "big-bore kit two years ago",
  "parts[0].partId": "",
  "parts[0].category": "cylinders",
  "parts[1].include": "on",
  "parts[1].description": "aftermarket shocks",
  "parts[1].partId": String(part.shocks),
  "parts[1].category": "",
  ...over,
});

describe("/requests", () => {
  it("lists open requests for the service writer and refuses the apprentice", async () => {
    const id = await newRequest();
    const out = await run(async () => list.loader(args(await requestAs(writer, "/requests"))));
    expect(out.status).toBe(200);
    const row = out.value.rows.find((r: { id: number }) => r.id === id);
    expect(row).toMatchObject({ status: "new", timeFrame: "3_months", changedBy: "the rider" });
    const refused = await run(async () =>
      list.loader(args(await requestAs(apprentice, "/requests"))),
    );
    expect(refused.status).toBe(403);
    const detail = await run(async () =>
      one.loader(args(await requestAs(apprentice, `/requests/${id}`), { id: String(id) })),
    );
    expect(detail.status).toBe(403);
  });

  it("sorts by time frame, the most urgent first", async () => {
    const late = await newRequest({ timeFrame: "flexible" });
    const soon = await newRequest({ timeFrame: "asap" });
    const out = await run(async () =>
      list.loader(args(await requestAs(writer, "/requests?sort=time_frame"))),
    );
    const ids = out.value.rows.map((r: { id: number }) => r.id);
    expect(ids.indexOf(soon)).toBeLessThan(ids.indexOf(late));
  });

  it("records each status change with who made it, and notes with their time", async () => {
    const id = await newRequest();
    const params = { id: String(id) };
    const moved = await run(async () =>
      one.action(
        args(await post(writer, `/requests/${id}`, { intent: "status", to: "contacted" }), params),
      ),
    );
    expect(moved.status).toBe(200);
    const refused = await run(async () =>
      one.action(
        args(await post(writer, `/requests/${id}`, { intent: "status", to: "converted" }), params),
      ),
    );
    expect(refused.status).toBe(400);
    expect(refused.value.result.error[""]).toEqual([
      "Use Convert to turn a request into a customer, bike and package.",
    ]);
    const empty = await run(async () =>
      one.action(
        args(await post(writer, `/requests/${id}`, { intent: "note", body: " " }), params),
      ),
    );
    expect(empty.value.result.error.body).toEqual(["Write the note first"]);
    await run(async () =>
      one.action(
        args(
          await post(writer, `/requests/${id}`, { intent: "note", body: "Left a message." }),
          params,
        ),
      ),
    );
    const page = await run(async () =>
      one.loader(args(await requestAs(writer, `/requests/${id}`), params)),
    );
    const { history, notes } = page.value.req;
    expect(
      history.map((h: { from: string | null; to: string; by: string }) => [h.from, h.to, h.by]),
    ).toEqual([
      ["new", "contacted", writer.name],
      [null, "new", "the rider (form)"],
    ]);
    expect(notes.map((n: { body: string; by: string }) => [n.body, n.by])).toEqual([
      ["Left a message.", writer.name],
    ]);
  });

  it("converts a request without a match into customer, bike, installed parts and a draft package", async () => {
    const id = await newRequest();
    const params = { id: String(id) };
    const out = await run(async () =>
      one.action(args(await post(writer, `/requests/${id}`, convertBody()), params)),
    );
    expect(out.status).toBe(302);
    const req = await db
      .selectFrom("build_requests")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    expect(req.status).toBe("converted");
    expect(out.location).toBe(`/packages/${req.package_id}`);
    const customer = await db
      .selectFrom("customers")
      .selectAll()
      .where("id", "=", req.customer_id!)
      .executeTakeFirstOrThrow();
    expect(customer.email).toBe(req.email);
    const bike = await db
      .selectFrom("bikes")
      .selectAll()
      .where("id", "=", req.bike_id!)
      .executeTakeFirstOrThrow();
    expect(bike).toMatchObject({
      customer_id: customer.id,
      year: 2019,
      model: "Longhaul tourer",
      vin: "9TW1LH22XND000042",
      engine_family_id: familyId,
      mileage: 31000,
    });
    const installed = await db
      .selectFrom("bike_parts")
      .select(["part_id", "category", "description"])
      .where("bike_id", "=", bike.id)
      .orderBy("id")
      .execute();
    expect(installed).toEqual([
      { part_id: null, category: "cylinders", description: "big-bore kit two years ago" },
      { part_id: part.shocks, category: "rear_shocks", description: "aftermarket shocks" },
    ]);
    const pkg = await db
      .selectFrom("packages")
      .selectAll()
      .where("id", "=", req.package_id!)
      .executeTakeFirstOrThrow();
    expect(pkg).toMatchObject({ status: "draft", bike_id: bike.id, builder_id: builder.id });
    const spec = normaliseSpec(pkg.spec);
    // the family's stock parts, with the catalog part the bike carries in its slot
    expect(spec.slots.cylinder!.partId).toBe(part.stockCyl);
    expect(spec.slots.flywheel!.partId).toBe(part.stockFly);
    expect(spec.slots.axle_adjusters!.partId).toBe(part.stockAxle);
    expect(spec.slots.rear_shocks!.partId).toBe(part.shocks);
    expect(spec.revLimitRpm).toBe(5600);
    const history = await db
      .selectFrom("build_request_status_changes")
      .select(["to_status", "changed_by"])
      .where("request_id", "=", id)
      .orderBy("id", "desc")
      .executeTakeFirstOrThrow();
    expect(history).toEqual({ to_status: "converted", changed_by: writer.id });
  });

  it("shows a matched customer and never creates a second one without the say-so", async () => {
    const first = await newRequest();
    await run(async () =>
      one.action(
        args(await post(writer, `/requests/${first}`, convertBody()), { id: String(first) }),
      ),
    );
    const firstRow = await db
      .selectFrom("build_requests")
      .select(["email", "customer_id"])
      .where("id", "=", first)
      .executeTakeFirstOrThrow();
    // the same rider asks again, with the e-mail in capitals
    const again = await newRequest({ email: firstRow.email.toUpperCase() });
    const params = { id: String(again) };
    const page = await run(async () =>
      one.loader(args(await requestAs(writer, `/requests/${again}`), params)),
    );
    expect(page.value.convert.matches.map((m: { id: number; by: string }) => [m.id, m.by])).toEqual(
      [[firstRow.customer_id, "email"]],
    );
    const count = async () =>
      Number(
        (
          await db
            .selectFrom("customers")
            .where("email", "ilike", firstRow.email)
            .select((eb) => eb.fn.countAll<number>().as("n"))
            .executeTakeFirstOrThrow()
        ).n,
      );
    const refused = await run(async () =>
      one.action(args(await post(writer, `/requests/${again}`, convertBody()), params)),
    );
    expect(refused.status).toBe(400);
    expect(refused.value.result.error.confirmNew[0]).toMatch(
      /is on file with this e-mail\. Link the request to them, or tick the box to create a second customer\.$/,
    );
    expect(await count()).toBe(1);
    const bikeOfFirst = await db
      .selectFrom("bikes")
      .select("id")
      .where("customer_id", "=", firstRow.customer_id!)
      .executeTakeFirstOrThrow();
    const linked = await run(async () =>
      one.action(
        args(
          await post(
            writer,
            `/requests/${again}`,
            convertBody({ customer: String(firstRow.customer_id), bike: String(bikeOfFirst.id) }),
          ),
          params,
        ),
      ),
    );
    expect(linked.status).toBe(302);
    expect(await count()).toBe(1);
    const row = await db
      .selectFrom("build_requests")
      .select(["customer_id", "bike_id"])
      .where("id", "=", again)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ customer_id: firstRow.customer_id, bike_id: bikeOfFirst.id });
  });
});
