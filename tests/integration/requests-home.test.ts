// The homes: the service writer sees the new requests and the packages waiting on a
// keep-check; the owner also sees the queue by status; builders and apprentices neither.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { createPackage } from "~/lib/packages/store.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { loader } from "~/routes/home";
import { createTestUser, requestAs } from "../support/auth";
import { args } from "../support/route";
import { tagOf } from "../support/requests";

const db = getDb();
const tag = tagOf();
let packageId = 0;

async function homeAs(role: "owner" | "builder" | "service_writer" | "apprentice") {
  const user = await createTestUser(db, role);
  return loader(args(await requestAs(user, "/")));
}

const newCount = async () =>
  Number(
    (
      await db
        .selectFrom("build_requests")
        .where("status", "=", "new")
        .select((eb) => eb.fn.countAll<number>().as("n"))
        .executeTakeFirstOrThrow()
    ).n,
  );

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  const c = await db
    .insertInto("customers")
    .values({ name: `Home ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const bike = await db
    .insertInto("bikes")
    .values({ customer_id: c.id, year: 2020, model: "Home tourer", notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  await db
    .insertInto("bike_parts")
    .values({ bike_id: bike.id, category: "exhaust", description: "Pipes" })
    .execute();
  packageId = await createPackage(
    db,
    { name: `Home package ${tag}`, bikeId: bike.id, isTemplate: false, builderId: null },
    null,
  );
  await db
    .insertInto("build_requests")
    .values({
      name: `Home ${tag}`,
      email: `home-${tag}@example.test`,
      phone: null,
      bike_year: 2020,
      bike_model: "Home tourer",
      goals: "More power.",
      budget: "unsure",
      time_frame: "flexible",
      contact_by: "email",
      consent: true,
    })
    .execute();
});

describe("homes and build requests", () => {
  it("shows the service writer the new requests and the packages waiting on a keep-check", async () => {
    const home = await homeAs("service_writer");
    const stat = home.stats.find((s) => s.label === "New build requests");
    expect(stat?.to).toBe("/requests?status=new");
    expect(stat?.value).toBeGreaterThanOrEqual(1);
    expect(stat!.value).toBeLessThanOrEqual(await newCount());
    expect(home.keepChecks.map((k) => k.id)).toContain(packageId);
    expect(home.stats.map((s) => s.label)).not.toContain("Requests: converted");
  });

  it("adds the request counts by status for the owner", async () => {
    const labels = (await homeAs("owner")).stats.map((s) => s.label);
    expect(labels).toEqual(
      expect.arrayContaining([
        "New build requests",
        "Requests: contacted",
        "Requests: waiting on rider",
        "Requests: converted",
        "Requests: declined",
      ]),
    );
  });

  it("shows builders and apprentices no requests and no keep-check queue", async () => {
    for (const role of ["builder", "apprentice"] as const) {
      const home = await homeAs(role);
      expect(home.stats.map((s) => s.label)).not.toContain("New build requests");
      expect(home.keepChecks).toEqual([]);
    }
  });
});
