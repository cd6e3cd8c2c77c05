// Packages: the list (filters, sort, pages), starting a package (from scratch, a shop
// template or a copy), status changes allowed and refused, comparing two revisions field
// by field, and restoring an old revision as a new one — through the routes' own
// loaders and actions against the test database.
import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { changeStatus, createPackage, PAGE_SIZE } from "~/lib/packages/store.server";
import { emptySpec } from "~/lib/bench/spec";
import { loader as listLoader } from "~/routes/packages";
import { action as newAction } from "~/routes/packages.new";
import { action as overviewAction, loader as overviewLoader } from "~/routes/packages.$id";
import { action as benchAction } from "~/routes/packages.$id.bench";
import { createTestUser, requestAs, type TestUser } from "../support/auth";

const db = getDb();
const tag = randomBytes(4).toString("hex");
let builder: TestUser;
let writer: TestUser;
let apprentice: TestUser;
let otherBuilder: TestUser;
let customerId = 0;
let bikeId = 0;
let otherBikeId = 0;
const part: Record<string, number> = {};

async function addPart(key: string, category: string, attributes: Record<string, number>) {
  const row = await db
    .insertInto("parts")
    .values({
      part_number: `P-${tag}-${key}`,
      category,
      maker: "Test Works",
      name: `Package test ${key}`,
      price_cents: 5000,
      tags: [],
      stock: false,
      attributes: JSON.stringify(attributes),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  part[key] = row.id;
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [builder, writer, apprentice, otherBuilder] = await Promise.all([
    createTestUser(db, "builder"),
    createTestUser(db, "service_writer"),
    createTestUser(db, "apprentice"),
    createTestUser(db, "builder"),
  ]);
  const c = await db
    .insertInto("customers")
    .values({ name: `Packages ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  customerId = c.id;
  bikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: c.id, year: 2019, model: `List twin ${tag}`, notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  otherBikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: c.id, year: 2021, model: `Other twin ${tag}`, notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await addPart("cyl", "cylinders", { boreMm: 101.6 });
  await addPart("cylbig", "cylinders", { boreMm: 104.8 });
  await addPart("fly", "flywheels", { strokeMm: 114.3 });
  await addPart("head", "heads", { chamberCc: 89 });
});

const call = <T>(fn: (args: never) => T, request: Request, params: Record<string, string> = {}) =>
  fn({ request, params, context: {} } as never);

/**
 * An action's answer as { status, body }, whether it returned or threw data()/a Response.
 * Anything else thrown is a bug in the action and fails the test.
 */
async function answer(
  p: Promise<unknown> | unknown,
): Promise<{ status: number; body: any; location: string | null }> {
  let v: unknown;
  try {
    v = await p;
  } catch (thrown) {
    const d = thrown as { type?: string } | null;
    if (!(thrown instanceof Response) && d?.type !== "DataWithResponseInit") throw thrown;
    v = thrown;
  }
  if (v instanceof Response)
    return { status: v.status, body: null, location: v.headers.get("Location") };
  const d = v as { type?: string; data?: unknown; init?: { status?: number } };
  if (d && d.type === "DataWithResponseInit")
    return { status: d.init?.status ?? 200, body: d.data, location: null };
  return { status: 200, body: v, location: null };
}

async function post(
  user: TestUser,
  url: string,
  fields: Record<string, string>,
  fn: (args: never) => unknown,
  params: Record<string, string> = {},
) {
  const request = await requestAs(user, url, { method: "POST", body: new URLSearchParams(fields) });
  return answer(call(fn, request, params));
}

async function list(user: TestUser, query: string) {
  return (await call(listLoader, await requestAs(user, `/packages?${query}`))) as Awaited<
    ReturnType<typeof listLoader>
  >;
}

async function bench(user: TestUser, id: number, fields: Record<string, string>) {
  const rev = (
    await db
      .selectFrom("packages")
      .select("current_revision")
      .where("id", "=", id)
      .executeTakeFirstOrThrow()
  ).current_revision;
  const out = await post(
    user,
    `/packages/${id}/bench`,
    { ...fields, expectedRevision: String(rev) },
    benchAction as never,
    { id: String(id) },
  );
  expect(out.status).toBe(200);
  return JSON.parse(out.body.saved).revision as number;
}

describe("package list", () => {
  let ids: number[] = [];
  beforeAll(async () => {
    // 22 packages on this test customer's bikes: more than one page, two builders, two statuses
    ids = [];
    for (let i = 0; i < PAGE_SIZE + 2; i++) {
      const name = `List ${tag} ${String(i).padStart(2, "0")}`;
      ids.push(
        await createPackage(
          db,
          {
            name,
            bikeId: i % 2 ? otherBikeId : bikeId,
            isTemplate: false,
            builderId: i < 3 ? otherBuilder.id : builder.id,
          },
          builder.id,
        ),
      );
    }
    for (const id of ids.slice(0, 4))
      expect(await changeStatus(db, id, "quoted", builder.id)).toEqual({ ok: true });
  });

  it("filters by customer, status and builder", async () => {
    const mine = await list(builder, `customer=${customerId}`);
    expect(mine.list.total).toBe(PAGE_SIZE + 2);
    expect(mine.list.rows.every((r) => r.customerId === customerId)).toBe(true);

    const quoted = await list(writer, `customer=${customerId}&status=quoted`);
    expect(quoted.list.total).toBe(4);
    expect(quoted.list.rows.map((r) => r.status)).toEqual(["quoted", "quoted", "quoted", "quoted"]);

    const byOther = await list(builder, `customer=${customerId}&builder=${otherBuilder.id}`);
    expect(byOther.list.rows.map((r) => r.name).sort()).toEqual([
      `List ${tag} 00`,
      `List ${tag} 01`,
      `List ${tag} 02`,
    ]);

    const none = await list(builder, `customer=${customerId}&status=delivered`);
    expect(none.list).toMatchObject({ total: 0, rows: [], pages: 1 });
  });

  it("ignores a status it does not know instead of failing", async () => {
    const out = await list(builder, `customer=${customerId}&status=bogus&sort=nonsense`);
    expect(out.filters).toMatchObject({ status: null, sort: "updated" });
    expect(out.list.total).toBe(PAGE_SIZE + 2);
  });

  it("sorts by name both ways and by most recently updated first by default", async () => {
    const asc = await list(builder, `customer=${customerId}&sort=name&dir=asc`);
    const names = asc.list.rows.map((r) => r.name);
    expect(names[0]).toBe(`List ${tag} 00`);
    expect(names).toEqual([...names].sort());
    const desc = await list(builder, `customer=${customerId}&sort=name&dir=desc`);
    expect(desc.list.rows[0]!.name).toBe(`List ${tag} ${String(PAGE_SIZE + 1).padStart(2, "0")}`);

    await db
      .updateTable("packages")
      .set({ updated_at: new Date(Date.now() + 60_000) })
      .where("id", "=", ids[7]!)
      .execute();
    const recent = await list(builder, `customer=${customerId}`);
    expect(recent.list.rows[0]!.id).toBe(ids[7]);
  });

  it("pages by twenty", async () => {
    const one = await list(builder, `customer=${customerId}&sort=name&dir=asc&page=1`);
    const two = await list(builder, `customer=${customerId}&sort=name&dir=asc&page=2`);
    expect(one.list).toMatchObject({ page: 1, pages: 2 });
    expect(one.list.rows).toHaveLength(PAGE_SIZE);
    expect(two.list.rows.map((r) => r.name)).toEqual([`List ${tag} 20`, `List ${tag} 21`]);
    const seen = new Set([...one.list.rows, ...two.list.rows].map((r) => r.id));
    expect(seen.size).toBe(PAGE_SIZE + 2);
  });

  it("is closed to the apprentice", async () => {
    await expect(call(listLoader, await requestAs(apprentice, "/packages"))).rejects.toMatchObject({
      init: { status: 403 },
    });
  });
});

describe("new package", () => {
  it("starts from scratch for a bike and opens the bench", async () => {
    const out = await post(
      writer,
      "/packages/new",
      { mode: "scratch", name: `Scratch ${tag}`, bikeId: String(bikeId) },
      newAction as never,
    );
    expect(out.status).toBe(302);
    const id = Number(out.location?.match(/^\/packages\/(\d+)\/bench$/)?.[1]);
    const row = await db
      .selectFrom("packages")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    expect(row).toMatchObject({
      name: `Scratch ${tag}`,
      bike_id: bikeId,
      is_template: false,
      status: "draft",
      current_revision: 1,
      copied_from_id: null,
      builder_id: null,
    });
    expect(row.spec).toEqual(emptySpec());
  });

  it("starts from a shop template or as a copy, carrying the source's spec", async () => {
    const template = await createPackage(
      db,
      { name: `Template ${tag}`, bikeId: null, isTemplate: true, builderId: builder.id },
      builder.id,
    );
    await bench(builder, template, {
      intent: "set-part",
      slot: "cylinder",
      partId: String(part.cylbig),
    });
    await bench(builder, template, {
      intent: "set-number",
      field: "revLimitRpm",
      value: "6100",
      unit: "rpm",
    });
    const source = await db
      .selectFrom("packages")
      .select("spec")
      .where("id", "=", template)
      .executeTakeFirstOrThrow();

    const fromTemplate = await post(
      builder,
      "/packages/new",
      {
        mode: "template",
        name: `From template ${tag}`,
        bikeId: String(bikeId),
        sourceId: String(template),
      },
      newAction as never,
    );
    expect(fromTemplate.status).toBe(302);
    const a = Number(fromTemplate.location!.split("/")[2]);
    const rowA = await db
      .selectFrom("packages")
      .selectAll()
      .where("id", "=", a)
      .executeTakeFirstOrThrow();
    expect(rowA).toMatchObject({
      copied_from_id: template,
      builder_id: builder.id,
      is_template: false,
      rev_limit_rpm: 6100,
    });
    expect(rowA.spec).toEqual(source.spec);
    const firstRev = await db
      .selectFrom("package_revisions")
      .select(["change", "results"])
      .where("package_id", "=", a)
      .executeTakeFirstOrThrow();
    expect(firstRev.change).toBe(`Started from package #${template}`);
    expect((firstRev.results as any).results.boreStrokeRatio).toBeNull(); // no stroke yet

    const copy = await post(
      builder,
      "/packages/new",
      { mode: "copy", name: `Copy ${tag}`, bikeId: String(otherBikeId), sourceId: String(a) },
      newAction as never,
    );
    const b = Number(copy.location!.split("/")[2]);
    const rowB = await db
      .selectFrom("packages")
      .selectAll()
      .where("id", "=", b)
      .executeTakeFirstOrThrow();
    expect(rowB).toMatchObject({ copied_from_id: a, bike_id: otherBikeId });
    expect(rowB.spec).toEqual(source.spec);
  });

  it("starts a shop template without a bike", async () => {
    const out = await post(
      builder,
      "/packages/new",
      { mode: "new-template", name: `New template ${tag}`, bikeId: String(bikeId) },
      newAction as never,
    );
    const id = Number(out.location!.split("/")[2]);
    expect(
      await db
        .selectFrom("packages")
        .select(["is_template", "bike_id"])
        .where("id", "=", id)
        .executeTakeFirstOrThrow(),
    ).toEqual({ is_template: true, bike_id: null });
  });

  it("refuses bad input beside the field and keeps the other values", async () => {
    const noName = await post(
      builder,
      "/packages/new",
      { mode: "scratch", name: " ", bikeId: String(bikeId) },
      newAction as never,
    );
    expect(noName.status).toBe(400);
    expect(noName.body.result.error.name).toEqual(["Give the package a name"]);
    expect(noName.body.result.initialValue.bikeId).toBe(String(bikeId));

    const noBike = await post(
      builder,
      "/packages/new",
      { mode: "scratch", name: `No bike ${tag}`, bikeId: "999999" },
      newAction as never,
    );
    expect(noBike.status).toBe(400);
    expect(noBike.body.result.error.bikeId).toEqual(["That bike is not on file"]);
    expect(noBike.body.result.initialValue.name).toBe(`No bike ${tag}`);

    const plain = await createPackage(
      db,
      { name: `Not a template ${tag}`, bikeId, isTemplate: false, builderId: null },
      null,
    );
    const notTemplate = await post(
      builder,
      "/packages/new",
      {
        mode: "template",
        name: `Bad source ${tag}`,
        bikeId: String(bikeId),
        sourceId: String(plain),
      },
      newAction as never,
    );
    expect(notTemplate.status).toBe(400);
    expect(notTemplate.body.result.error.sourceId).toEqual(["That is not a shop template"]);

    const noSource = await post(
      builder,
      "/packages/new",
      { mode: "copy", name: `No source ${tag}`, bikeId: String(bikeId) },
      newAction as never,
    );
    expect(noSource.status).toBe(400);
    expect(noSource.body.result.error.sourceId).toEqual(["Pick the package to copy"]);

    // nothing of this test's was saved but the fixture (counted by name: other files
    // add packages in parallel)
    const saved = await db
      .selectFrom("packages")
      .select("name")
      .where("name", "like", `% ${tag}`)
      .where("name", "in", [
        `No bike ${tag}`,
        `Bad source ${tag}`,
        `No source ${tag}`,
        `Not a template ${tag}`,
      ])
      .execute();
    expect(saved.map((r) => r.name)).toEqual([`Not a template ${tag}`]);
    expect(
      await db
        .selectFrom("packages")
        .select("id")
        .where("bike_id", "=", bikeId)
        .where("name", "=", " ")
        .execute(),
    ).toEqual([]);
  });

  it("is closed to the apprentice", async () => {
    const out = await post(
      apprentice,
      "/packages/new",
      { mode: "scratch", name: `Apprentice ${tag}`, bikeId: String(bikeId) },
      newAction as never,
    );
    expect(out.status).toBe(403);
  });
});

describe("status", () => {
  const to = (user: TestUser, id: number, status: string) =>
    post(user, `/packages/${id}`, { intent: "status", to: status }, overviewAction as never, {
      id: String(id),
    });
  const statusOf = async (id: number) =>
    (
      await db
        .selectFrom("packages")
        .select("status")
        .where("id", "=", id)
        .executeTakeFirstOrThrow()
    ).status;

  it("moves along the allowed path and records each change", async () => {
    const id = await createPackage(
      db,
      { name: `Status ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    for (const [user, s] of [
      [writer, "quoted"],
      [builder, "approved"],
      [builder, "in_build"],
      [builder, "on_dyno"],
      [builder, "in_build"],
      [builder, "on_dyno"],
      [writer, "delivered"],
    ] as const) {
      const out = await to(user, id, s);
      expect(out.status, s).toBe(200);
      expect(await statusOf(id)).toBe(s);
    }
    const view = (await call(overviewLoader, await requestAs(builder, `/packages/${id}`), {
      id: String(id),
    })) as any;
    expect(view.statuses.map((c: any) => c.to)).toEqual([
      "delivered",
      "on_dyno",
      "in_build",
      "on_dyno",
      "in_build",
      "approved",
      "quoted",
      "draft",
    ]);
    expect(view.statuses[0]).toMatchObject({ from: "on_dyno", by: writer.name });
    expect(view.transitions).toEqual([]);
  });

  it("refuses a jump the path does not allow, a status for a template, an unknown status, and the apprentice", async () => {
    const id = await createPackage(
      db,
      { name: `Status refused ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    const jump = await to(builder, id, "delivered");
    expect(jump.status).toBe(400);
    expect(jump.body.message).toMatch(/draft cannot move to delivered/);
    expect(await statusOf(id)).toBe("draft");

    const template = await createPackage(
      db,
      { name: `Status template ${tag}`, bikeId: null, isTemplate: true, builderId: null },
      null,
    );
    const t = await to(builder, template, "quoted");
    expect(t.status).toBe(400);
    expect(t.body.message).toMatch(/template/);

    expect((await to(builder, id, "shipped")).status).toBe(400);
    expect((await to(apprentice, id, "quoted")).status).toBe(403);
    expect(await statusOf(id)).toBe("draft");

    const changes = await db
      .selectFrom("package_status_changes")
      .select("to_status")
      .where("package_id", "=", id)
      .execute();
    expect(changes.map((c) => c.to_status)).toEqual(["draft"]);
  });

  it("reopens a cancelled package as a draft and locks the bench once approved", async () => {
    const id = await createPackage(
      db,
      { name: `Cancel ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    expect((await to(builder, id, "cancelled")).status).toBe(200);
    expect((await to(builder, id, "quoted")).status).toBe(400);
    expect((await to(builder, id, "draft")).status).toBe(200);
    await to(builder, id, "quoted");
    await to(builder, id, "approved");
    const locked = await post(
      builder,
      `/packages/${id}/bench`,
      { intent: "clear-slot", slot: "cam", expectedRevision: "1" },
      benchAction as never,
      { id: String(id) },
    );
    expect(locked.status).toBe(400);
    expect(locked.body.errors).toEqual({
      form: ["The package is approved: its spec is locked. Move it back to draft to change it."],
    });
  });
});

describe("revisions", () => {
  it("compares two revisions field by field: spec, figures and findings", async () => {
    const id = await createPackage(
      db,
      { name: `Compare ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    await bench(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cyl) }); // 2
    await bench(builder, id, { intent: "set-part", slot: "flywheel", partId: String(part.fly) }); // 3
    await bench(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cylbig) }); // 4
    await bench(builder, id, {
      intent: "set-measured",
      slot: "cylinder",
      field: "boreMm",
      value: "104.9",
      unit: "mm",
    }); // 5
    await bench(builder, id, {
      intent: "set-number",
      field: "revLimitRpm",
      value: "6000",
      unit: "rpm",
    }); // 6

    const view = (await call(overviewLoader, await requestAs(writer, `/packages/${id}?a=3&b=6`), {
      id: String(id),
    })) as any;
    const c = view.compare;
    expect(c.a.revision).toBe(3);
    expect(c.b.revision).toBe(6);
    expect(c.specChanges).toEqual([
      {
        key: "cylinder.part",
        label: "Bore (cylinders)",
        before: `P-${tag}-cyl Package test cyl`,
        after: `P-${tag}-cylbig Package test cylbig`,
      },
      {
        key: "cylinder.boreMm",
        label: "Bore (cylinders): measured bore",
        before: "nominal",
        after: "104.9 mm",
      },
      { key: "revLimitRpm", label: "Rev limit", before: "—", after: "6000 rpm" },
    ]);
    const byKey = Object.fromEntries(c.resultChanges.map((r: any) => [r.key, r]));
    // 2 × π/4 × bore² × stroke: 101.6 mm → 1853 cc, 104.9 mm → 1976 cc
    expect(byKey.displacementCc).toMatchObject({
      label: "Displacement (cc)",
      before: "1853",
      after: "1976",
    });
    expect(byKey.meanPistonSpeedMs).toMatchObject({ before: "—", after: "22.9" });
    expect(byKey.rodRatio).toBeUndefined(); // no rod in either: unchanged rows are left out

    const same = (await call(overviewLoader, await requestAs(writer, `/packages/${id}?a=6&b=6`), {
      id: String(id),
    })) as any;
    expect(same.compare).toMatchObject({ specChanges: [], resultChanges: [] });

    const missing = (await call(
      overviewLoader,
      await requestAs(writer, `/packages/${id}?a=2&b=99`),
      { id: String(id) },
    )) as any;
    expect(missing).toMatchObject({ compare: null, compareAsked: true });
  });

  it("restores an old revision as a new one, keeping every revision in between", async () => {
    const id = await createPackage(
      db,
      { name: `Restore ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
      builder.id,
    );
    await bench(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cyl) }); // 2
    await bench(builder, id, { intent: "set-part", slot: "head", partId: String(part.head) }); // 3
    await bench(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cylbig) }); // 4
    const rev2 = await db
      .selectFrom("package_revisions")
      .select(["spec", "results"])
      .where("package_id", "=", id)
      .where("revision", "=", 2)
      .executeTakeFirstOrThrow();

    const restore = (fields: Record<string, string>, user = builder) =>
      post(user, `/packages/${id}`, { intent: "restore", ...fields }, overviewAction as never, {
        id: String(id),
      });
    const stale = await restore({ revision: "2", expectedRevision: "3" });
    expect(stale.status).toBe(409);
    expect(stale.body.message).toMatch(/revision 4/);
    expect((await restore({ revision: "2", expectedRevision: "4" }, writer)).status).toBe(403);
    expect((await restore({ revision: "42", expectedRevision: "4" })).status).toBe(404);

    const ok = await restore({ revision: "2", expectedRevision: "4" });
    expect(ok.status).toBe(200);
    expect(ok.body.message).toBe("Revision 2 restored as revision 5.");
    const row = await db
      .selectFrom("packages")
      .select(["current_revision", "spec", "results"])
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    expect(row.current_revision).toBe(5);
    expect(row.spec).toEqual(rev2.spec);
    expect(row.results).toEqual(rev2.results);
    const revs = await db
      .selectFrom("package_revisions")
      .select(["revision", "change"])
      .where("package_id", "=", id)
      .orderBy("revision")
      .execute();
    expect(revs.map((r) => r.revision)).toEqual([1, 2, 3, 4, 5]);
    expect(revs.at(-1)!.change).toBe("Restored revision 2");
  });
});
