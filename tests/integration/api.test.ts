// The JSON routes: the shape of each answer, who may ask (401 signed out, 403 for a
// role without the permission, no prices for the apprentice), and bad input → 400 with
// the errors by field.
import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { computeSpec } from "../../calc";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createRule } from "~/lib/fit-rules/rules.server";
import { createPackage } from "~/lib/packages/store.server";
import { action as benchAction } from "~/routes/packages.$id.bench";
import { action as calcAction, loader as calcLoader } from "~/routes/api.calc";
import { loader as packageLoader } from "~/routes/api.packages.$id";
import { loader as partsLoader } from "~/routes/api.parts";
import { createTestUser, requestAs, signedOutRequest, type TestUser } from "../support/auth";

const db = getDb();
const tag = randomBytes(4).toString("hex");
const users = {} as Record<"owner" | "builder" | "service_writer" | "apprentice", TestUser>;
const part: Record<string, number> = {};
let packageId = 0;
let bikeId = 0;

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  for (const role of ["owner", "builder", "service_writer", "apprentice"] as const)
    users[role] = await createTestUser(db, role);
  const add = async (
    key: string,
    category: string,
    attributes: Record<string, number>,
    tags: string[] = [],
    archived = false,
  ) => {
    const row = await db
      .insertInto("parts")
      .values({
        part_number: `API-${tag}-${key}`,
        category,
        maker: "Test Works",
        name: `Api ${key} ${tag}`,
        price_cents: 12345,
        tags,
        stock: false,
        attributes: JSON.stringify(attributes),
        archived_at: archived ? new Date() : null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    part[key] = row.id;
  };
  await add("cyl", "cylinders", { boreMm: 101.6 }, [`api-bore-${tag}`]);
  await add("cam", "cams", { intakeClosesAbdcDeg: 30 }, [`api-cam-${tag}`]);
  await add("old", "cams", { intakeClosesAbdcDeg: 40 }, [`api-cam-${tag}`], true);
  const c = await db
    .insertInto("customers")
    .values({ name: `Api ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const bike = await db
    .insertInto("bikes")
    .values({ customer_id: c.id, year: 2022, model: `Api twin ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  bikeId = bike.id;
  packageId = await createPackage(
    db,
    { name: `Api package ${tag}`, bikeId: bike.id, isTemplate: false, builderId: users.builder.id },
    users.builder.id,
  );
  const request = await requestAs(users.builder, `/packages/${packageId}/bench`, {
    method: "POST",
    body: new URLSearchParams({
      intent: "set-part",
      slot: "cylinder",
      partId: String(part.cyl),
      expectedRevision: "1",
    }),
  });
  const saved = (await benchAction({
    request,
    params: { id: String(packageId) },
    context: {},
  } as never)) as { data: { ok: boolean } };
  expect(saved.data.ok).toBe(true);
});

/** Runs a JSON route and reads its Response, thrown or returned. */
async function json(
  run: () => Promise<unknown> | unknown,
): Promise<{ status: number; body: any; headers: Headers }> {
  let out: unknown;
  try {
    out = await run();
  } catch (thrown) {
    out = thrown;
  }
  if (!(out instanceof Response))
    throw new Error(`expected a Response, got ${JSON.stringify(out)}`);
  expect(out.headers.get("Content-Type")).toMatch(/application\/json/);
  return { status: out.status, body: await out.json(), headers: out.headers };
}

const args = (request: Request, params: Record<string, string> = {}) =>
  ({ request, params, context: {} }) as never;

describe("GET /api/parts", () => {
  const get = async (who: keyof typeof users | null, query: string) => {
    const request = who
      ? await requestAs(users[who], `/api/parts?${query}`)
      : signedOutRequest(`/api/parts?${query}`);
    return json(() => partsLoader(args(request)));
  };

  it("answers active parts matching the search, with prices for staff who quote", async () => {
    const out = await get("service_writer", `q=api-cam-${tag}`);
    expect(out.status).toBe(200);
    expect(out.headers.get("Cache-Control")).toBe("private, no-store");
    expect(out.body.parts).toEqual([
      {
        id: part.cam,
        partNumber: `API-${tag}-cam`,
        category: "cams",
        maker: "Test Works",
        name: `Api cam ${tag}`,
        tags: [`api-cam-${tag}`],
        stock: false,
        attributes: { intakeClosesAbdcDeg: 30 },
        priceCents: 12345,
      },
    ]);
  });

  it("filters by category and searches part numbers", async () => {
    const out = await get("builder", `q=API-${tag}&category=cylinders`);
    expect(out.body.parts.map((p: any) => p.id)).toEqual([part.cyl]);
    const nothing = await get("builder", `q=API-${tag}&category=flywheels`);
    expect(nothing.body.parts).toEqual([]);
  });

  it("gives the apprentice the parts without prices", async () => {
    const out = await get("apprentice", `q=API-${tag}`);
    expect(out.status).toBe(200);
    expect(out.body.parts.map((p: any) => p.id).sort()).toEqual([part.cam, part.cyl].sort());
    for (const p of out.body.parts) expect(p).not.toHaveProperty("priceCents");
  });

  it("answers 401 to a request without a session", async () => {
    const out = await get(null, "q=cam");
    expect(out.status).toBe(401);
    expect(out.body.error).toMatch(/Sign in/);
  });
});

describe("GET /api/packages/:id", () => {
  const get = async (who: keyof typeof users | null, id: string | number) => {
    const request = who
      ? await requestAs(users[who], `/api/packages/${id}`)
      : signedOutRequest(`/api/packages/${id}`);
    return json(() => packageLoader(args(request, { id: String(id) })));
  };

  it("answers the package with its current revision's spec, parts, figures and findings", async () => {
    const out = await get("service_writer", packageId);
    expect(out.status).toBe(200);
    expect(Object.keys(out.body).sort()).toEqual([
      "cautions",
      "findings",
      "inputErrors",
      "missing",
      "package",
      "parts",
      "results",
      "revision",
      "spec",
    ]);
    expect(out.body.package).toMatchObject({
      id: packageId,
      name: `Api package ${tag}`,
      status: "draft",
      isTemplate: false,
      builderId: users.builder.id,
      revision: 2,
    });
    expect(out.body.revision).toMatchObject({ number: 2, savedBy: users.builder.name });
    expect(out.body.spec.slots.cylinder).toEqual({ partId: part.cyl, measured: {} });
    expect(out.body.parts).toEqual([expect.objectContaining({ id: part.cyl, priceCents: 12345 })]);
    expect(out.body.results.boreStrokeRatio).toBeNull();
    expect(out.body.missing).toContain("strokeMm");
    expect(Array.isArray(out.body.findings)).toBe(true);
  });

  it("answers each finding with its rule's name and message and the values its condition used", async () => {
    const rule = await createRule(
      db,
      {
        name: `Api big bore ${tag}`,
        kind: "caution",
        condition: `bore_mm > 100 and has("api-bore-${tag}")`,
        message: "Check the case spigots.",
        upgrade_category: null,
        suggested_part_id: null,
        active: true,
      },
      null,
    );
    if (!rule.ok) throw new Error("rule fixture did not save");
    const id = await createPackage(
      db,
      {
        name: `Api findings ${tag}`,
        bikeId,
        isTemplate: false,
        builderId: users.builder.id,
        spec: { slots: { cylinder: { partId: part.cyl, measured: {} } } },
      },
      users.builder.id,
    );
    const out = await get("owner", id);
    expect(out.status).toBe(200);
    expect(out.body.findings.find((f: any) => f.ruleId === rule.rule.id)).toEqual({
      ruleId: rule.rule.id,
      ruleVersion: 1,
      kind: "caution",
      ruleName: `Api big bore ${tag}`,
      message: "Check the case spigots.",
      upgradeCategory: null,
      suggestedPartId: null,
      triggeredBy: { bore_mm: 101.6, [`has("api-bore-${tag}")`]: true },
    });
  });

  it("answers 404 for a package that does not exist or a malformed number", async () => {
    expect((await get("owner", 999999)).status).toBe(404);
    expect((await get("owner", "abc")).status).toBe(404);
  });

  it("answers 403 to the apprentice (packages carry customer details) and 401 signed out", async () => {
    const apprentice = await get("apprentice", packageId);
    expect(apprentice.status).toBe(403);
    expect(apprentice.body).not.toHaveProperty("package");
    expect((await get(null, packageId)).status).toBe(401);
  });
});

describe("POST /api/calc", () => {
  const SPEC = {
    boreMm: 101.6,
    strokeMm: 114.3,
    chamberCc: 89,
    gasketBoreMm: 102.1,
    gasketThicknessMm: 1.02,
    deckClearanceMm: 0.25,
    pistonDomeCc: -4.8,
    revLimitRpm: 6000,
  };
  const postCalc = async (
    who: keyof typeof users | null,
    body: string,
    headers: Record<string, string> = { "Content-Type": "application/json" },
  ) => {
    const init = { method: "POST", body, headers };
    const request = who
      ? await requestAs(users[who], "/api/calc", init)
      : signedOutRequest("/api/calc", init);
    return json(() => calcAction(args(request)));
  };

  it("answers calc's figures, cautions, steps and missing inputs for every role, the apprentice too", async () => {
    const expected = computeSpec(SPEC);
    if (!expected.ok) throw new Error("fixture spec does not compute");
    for (const who of ["owner", "builder", "service_writer", "apprentice"] as const) {
      const out = await postCalc(who, JSON.stringify(SPEC));
      expect(out.status, who).toBe(200);
      expect(out.body.results).toEqual(expected.results);
      expect(out.body.missing).toEqual(expected.missing);
      expect(out.body.steps.length).toBe(expected.steps.length);
      expect(out.body).toHaveProperty("cautions");
    }
  });

  it("answers 400 with the errors by field for bad input", async () => {
    const wrongType = await postCalc("builder", JSON.stringify({ ...SPEC, boreMm: "4.000" }));
    expect(wrongType.status).toBe(400);
    expect(wrongType.body.fieldErrors).toEqual({ boreMm: ["must be a number"] });

    const unknown = await postCalc("builder", JSON.stringify({ ...SPEC, boost: 9 }));
    expect(unknown.status).toBe(400);
    expect(unknown.body.fieldErrors).toEqual({ boost: ["is not a spec field"] });

    const impossible = await postCalc("builder", JSON.stringify({ ...SPEC, gasketBoreMm: 99 }));
    expect(impossible.status).toBe(400);
    expect(Object.keys(impossible.body.fieldErrors)).toEqual(["gasketBoreMm"]);

    const notJson = await postCalc("builder", "bore=4");
    expect(notJson.status).toBe(400);
    expect(notJson.body.fieldErrors).toEqual({ spec: ["must be a JSON object"] });
  });

  it("answers 401 signed out, 403 from another site, 405 to a GET", async () => {
    expect((await postCalc(null, JSON.stringify(SPEC))).status).toBe(401);
    const foreign = await postCalc("builder", JSON.stringify(SPEC), {
      "Content-Type": "application/json",
      Origin: "http://elsewhere.test",
    });
    expect(foreign.status).toBe(403);
    const get = await json(async () =>
      calcLoader(args(await requestAs(users.builder, "/api/calc"))),
    );
    expect(get.status).toBe(405);
  });
});
