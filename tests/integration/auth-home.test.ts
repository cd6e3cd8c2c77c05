import { describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { loader } from "~/routes/home";
import { createTestUser, requestAs } from "../support/auth";

const args = (request: Request) => ({ request, params: {}, context: {} }) as never;

async function homeAs(role: "owner" | "builder" | "service_writer" | "apprentice") {
  const user = await createTestUser(getDb(), role);
  return loader(args(await requestAs(user, "/")));
}

describe("home per role", () => {
  it("the owner sees staff, rules, parts and customers, and every section to open", async () => {
    const home = await homeAs("owner");
    expect(home.stats.map((s) => s.label)).toEqual(
      expect.arrayContaining([
        "Active staff",
        "Active fit rules",
        "Parts on the shelf",
        "Customers on file",
        "My open packages",
      ]),
    );
    expect(home.links.map((l) => l.to)).toEqual(
      expect.arrayContaining(["/staff", "/packages", "/parts", "/rules"]),
    );
  });

  it("the builder counts their own open packages; no staff", async () => {
    const home = await homeAs("builder");
    const labels = home.stats.map((s) => s.label);
    expect(labels).toContain("My open packages");
    expect(labels).not.toContain("Active staff");
    expect(home.links.map((l) => l.to)).not.toContain("/staff");
  });

  it("the service writer sees customers and bikes", async () => {
    const labels = (await homeAs("service_writer")).stats.map((s) => s.label);
    expect(labels).toEqual(expect.arrayContaining(["Customers on file", "Bikes on file"]));
    expect(labels).not.toContain("My open packages");
  });

  it("the apprentice sees no customer records and no package list", async () => {
    const home = await homeAs("apprentice");
    const labels = home.stats.map((s) => s.label);
    expect(labels).not.toContain("Customers on file");
    expect(labels).not.toContain("Active staff");
    expect(home.statuses).toEqual([]);
    expect(home.links.map((l) => l.to)).not.toContain("/packages");
  });
});
