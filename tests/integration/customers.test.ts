// Customers and bikes: search by name, phone, e-mail and VIN; installed parts added,
// edited and removed (with their history); who may see and change what; export as JSON
// and CSV; and erasure that keeps the packages, anonymised.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createPackage } from "~/lib/packages/store.server";
import * as list from "~/routes/customers";
import * as one from "~/routes/customers.$id";
import * as exp from "~/routes/customers.$id.export";
import * as bikePage from "~/routes/bikes.$id";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { args, post, run } from "../support/route";
import { tagOf } from "../support/requests";

const db = getDb();
const tag = tagOf();
const digits = String(Math.floor(Math.random() * 1e7)).padStart(7, "0");
const vin = `9TW${tag.toUpperCase().replace(/[IOQ]/g, "X")}`.padEnd(17, "7").slice(0, 17);
let owner: TestUser;
let writer: TestUser;
let builder: TestUser;
let apprentice: TestUser;
let customerId = 0;
let bikeId = 0;
let packageId = 0;
let shocks = 0;

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [owner, writer, builder, apprentice] = await Promise.all([
    createTestUser(db, "owner"),
    createTestUser(db, "service_writer"),
    createTestUser(db, "builder"),
    createTestUser(db, "apprentice"),
  ]);
  customerId = (
    await db
      .insertInto("customers")
      .values({
        name: `Marguerite Quillfeather ${tag}`,
        email: `mq-${tag}@example.test`,
        phone: `(555) ${digits.slice(0, 3)}-${digits.slice(3)}`,
        city: "Testville",
        notes: "",
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  bikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: customerId, year: 2020, model: "Tourer", vin, notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  shocks = (
    await db
      .insertInto("parts")
      .values({
        part_number: `CU-${tag}-SH`,
        category: "rear_shocks",
        maker: "Test Works",
        name: "Test shocks",
        price_cents: 100,
        tags: [],
        attributes: "{}",
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  packageId = await createPackage(
    db,
    { name: `Kept package ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
    builder.id,
  );
  await db
    .insertInto("build_requests")
    .values({
      name: `Marguerite Quillfeather ${tag}`,
      email: `mq-${tag}@example.test`,
      phone: null,
      bike_year: 2020,
      bike_model: "Tourer",
      goals: "More torque for the mountains.",
      budget: "unsure",
      time_frame: "flexible",
      contact_by: "email",
      consent: true,
      customer_id: customerId,
    })
    .execute();
});

const found = async (q: string) => {
  const out = await run(async () =>
    list.loader(args(await requestAs(writer, `/customers?q=${encodeURIComponent(q)}`))),
  );
  return out.value.rows.map((r: { id: number }) => r.id) as number[];
};

describe("/customers", () => {
  it("finds a customer by name (also misspelt), phone, e-mail and VIN", async () => {
    expect(await found(`Quillfeather ${tag}`)).toContain(customerId);
    expect(await found(`Quilfeather ${tag}`)).toContain(customerId);
    expect(await found(`555${digits}`)).toContain(customerId);
    expect(await found(`555-${digits.slice(0, 3)} ${digits.slice(3)}`)).toContain(customerId);
    expect(await found(`MQ-${tag}@EXAMPLE`)).toContain(customerId);
    expect(await found(vin.toLowerCase())).toContain(customerId);
    expect(await found(`nobody-${tag}`)).not.toContain(customerId);
  });

  it("refuses the apprentice every customer and bike page; the builder reads but cannot edit", async () => {
    for (const [fn, path, params] of [
      [list.loader, "/customers", {}],
      [one.loader, `/customers/${customerId}`, { id: String(customerId) }],
      [bikePage.loader, `/bikes/${bikeId}`, { id: String(bikeId) }],
    ] as const) {
      const refused = await run(async () =>
        (fn as (a: unknown) => Promise<unknown>)(args(await requestAs(apprentice, path), params)),
      );
      expect(refused.status, path).toBe(403);
      const read = await run(async () =>
        (fn as (a: unknown) => Promise<unknown>)(args(await requestAs(builder, path), params)),
      );
      expect(read.status, path).toBe(200);
    }
    const edit = await run(async () =>
      bikePage.action(
        args(
          await post(builder, `/bikes/${bikeId}`, { intent: "add-part", partId: String(shocks) }),
          {
            id: String(bikeId),
          },
        ),
      ),
    );
    expect(edit.status).toBe(403);
  });

  it("adds, edits and removes installed parts, keeping the removal in the history", async () => {
    const params = { id: String(bikeId) };
    const bad = await run(async () =>
      bikePage.action(
        args(
          await post(writer, `/bikes/${bikeId}`, {
            intent: "add-part",
            partId: "",
            category: "",
            description: "",
            fittedOn: "2024-13-40",
          }),
          params,
        ),
      ),
    );
    expect(bad.status).toBe(400);
    expect(bad.value.result.error.category).toEqual([
      "Pick the catalog part, or a category for the free text",
    ]);
    expect(bad.value.result.error.fittedOn).toEqual(["Enter a real date"]);
    const add = (body: Record<string, string>) =>
      run(async () => bikePage.action(args(await post(writer, `/bikes/${bikeId}`, body), params)));
    expect(
      (
        await add({
          intent: "add-part",
          partId: String(shocks),
          fittedOn: "2024-04-18",
          fittedMileage: "12000",
        })
      ).value.saved,
    ).toBe("Part added.");
    await add({
      intent: "add-part",
      category: "exhaust",
      description: "Loud pipes, maker unknown",
    });
    const page = await run(async () =>
      bikePage.loader(args(await requestAs(writer, `/bikes/${bikeId}`), params)),
    );
    const rows = page.value.bike.parts as {
      id: number;
      label: string;
      fittedOn: string | null;
      fittedMileage: number | null;
    }[];
    expect(rows.map((r) => [r.label, r.fittedOn, r.fittedMileage])).toEqual([
      ["Loud pipes, maker unknown", null, null],
      [`CU-${tag}-SH Test shocks`, "2024-04-18", 12000],
    ]);
    const exhaust = rows[0]!.id;
    const edited = await add({
      intent: "edit-part",
      partRowId: String(exhaust),
      category: "exhaust",
      description: "Loud pipes, 2-into-1",
      fittedOn: "2023-06-01",
    });
    expect(edited.value.saved).toBe("Part saved.");
    const removed = await add({ intent: "remove-part", partRowId: String(exhaust) });
    expect(removed.value.saved).toBe("Part removed; it stays in the bike's history.");
    const after = await run(async () =>
      bikePage.loader(args(await requestAs(writer, `/bikes/${bikeId}`), params)),
    );
    expect(after.value.bike.parts.map((p: { label: string }) => p.label)).toEqual([
      `CU-${tag}-SH Test shocks`,
    ]);
    const whats = after.value.bike.history.map((h: { what: string }) => h.what);
    expect(whats).toContain("Removed: Loud pipes, 2-into-1");
    expect(whats).toContain("Fitted: Loud pipes, 2-into-1");
  });

  it("exports everything kept about the customer as JSON and CSV, for the owner only", async () => {
    const params = { id: String(customerId) };
    const refused = await run(async () =>
      exp.loader(args(await requestAs(writer, `/customers/${customerId}/export`), params)),
    );
    expect(refused.status).toBe(403);
    const json = await exp.loader(
      args(await requestAs(owner, `/customers/${customerId}/export`), params),
    );
    expect(json.headers.get("Content-Type")).toBe("application/json; charset=utf-8");
    const body = JSON.parse(await json.text());
    expect(body.customer).toMatchObject({ id: customerId, email: `mq-${tag}@example.test` });
    expect(body.bikes[0].vin).toBe(vin);
    expect(body.requests[0].goals).toBe("More torque for the mountains.");
    expect(body.packages.map((p: { id: number }) => p.id)).toEqual([packageId]);
    const csv = await exp.loader(
      args(await requestAs(owner, `/customers/${customerId}/export?format=csv`), params),
    );
    const text = await csv.text();
    expect(text.split("\r\n")[0]).toBe("record,id,field,value");
    expect(text).toContain(`customer,${customerId},email,mq-${tag}@example.test`);
    expect(text).toContain(`bike,${bikeId},vin,${vin}`);
  });

  it("erases the customer's personal data and keeps the packages, anonymised", async () => {
    const params = { id: String(customerId) };
    const writerTry = await run(async () =>
      one.action(
        args(
          await post(writer, `/customers/${customerId}`, { intent: "erase", confirm: "x" }),
          params,
        ),
      ),
    );
    expect(writerTry.status).toBe(403);
    const wrong = await run(async () =>
      one.action(
        args(
          await post(owner, `/customers/${customerId}`, { intent: "erase", confirm: "x" }),
          params,
        ),
      ),
    );
    expect(wrong.status).toBe(400);
    const done = await run(async () =>
      one.action(
        args(
          await post(owner, `/customers/${customerId}`, {
            intent: "erase",
            confirm: `Marguerite Quillfeather ${tag}`,
          }),
          params,
        ),
      ),
    );
    expect(done.status).toBe(200);
    const c = await db
      .selectFrom("customers")
      .selectAll()
      .where("id", "=", customerId)
      .executeTakeFirstOrThrow();
    expect(c).toMatchObject({
      name: `Erased customer #${customerId}`,
      email: null,
      phone: null,
      city: null,
    });
    const b = await db
      .selectFrom("bikes")
      .selectAll()
      .where("id", "=", bikeId)
      .executeTakeFirstOrThrow();
    expect(b.vin).toBe(null);
    const r = await db
      .selectFrom("build_requests")
      .selectAll()
      .where("customer_id", "=", customerId)
      .executeTakeFirstOrThrow();
    expect(r).toMatchObject({ email: "", goals: "", name: `Erased customer #${customerId}` });
    const p = await db
      .selectFrom("packages")
      .select(["id", "bike_id"])
      .where("id", "=", packageId)
      .executeTakeFirstOrThrow();
    expect(p).toEqual({ id: packageId, bike_id: bikeId });
    expect(await found(`Quillfeather ${tag}`)).not.toContain(customerId);
  });
});
