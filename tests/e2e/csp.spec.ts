// The pages under the production server's Content-Security-Policy (scripts/serve.mjs):
// nothing is blocked — no policy violation, no console error — on a first load, on
// client-side navigation, on a bench edit, and on the error pages, for each role.
import { expect, test, type Page } from "@playwright/test";
import type { Role } from "../../db/schema/core";
import { createDb } from "../../db/connect";
import { e2eDatabaseUrl } from "../support/db-url";
import { loginAs } from "./support/login";

async function freshPackage(name: string): Promise<number> {
  const db = createDb(e2eDatabaseUrl(), 1);
  try {
    const { createPackage } = await import("../../app/lib/packages/store.server");
    const bike = await db.selectFrom("bikes").select("id").orderBy("id").executeTakeFirstOrThrow();
    const builder = await db
      .selectFrom("users")
      .select("id")
      .where("role", "=", "builder")
      .executeTakeFirstOrThrow();
    return await createPackage(
      db,
      { name, bikeId: bike.id, isTemplate: false, builderId: builder.id },
      builder.id,
    );
  } finally {
    await db.destroy();
  }
}

/** Starts recording policy violations and console errors of the page. */
async function watch(page: Page) {
  const problems: string[] = [];
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => {
      console.error(
        `CSP violation: ${e.violatedDirective} blocked ${e.blockedURI || "inline"} at ${e.sourceFile}:${e.lineNumber}:${e.columnNumber}`,
      );
    });
  });
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(m.text());
  });
  page.on("pageerror", (e) => problems.push(e.message));
  return problems;
}

const PAGES: Record<Role, string[]> = {
  owner: [
    "/",
    "/packages",
    "/parts",
    "/parts/new",
    "/parts/import",
    "/rules",
    "/rules/new",
    "/staff",
  ],
  builder: ["/", "/packages", "/packages/new", "/parts", "/rules"],
  service_writer: ["/", "/packages", "/parts"],
  apprentice: ["/", "/parts"],
};

for (const [role, paths] of Object.entries(PAGES) as [Role, string[]][]) {
  test(`no policy violation on the ${role.replace("_", " ")}'s pages`, async ({ page }) => {
    const problems = await watch(page);
    await loginAs(page, role);
    for (const path of paths) {
      const res = await page.goto(path);
      expect(res?.status(), path).toBe(200);
      // hydrated: the framework's inline scripts ran
      await page.waitForFunction(() => "__reactRouterRouteModules" in window);
    }
    // a client-side navigation through the header
    await page.goto("/");
    await page.getByRole("navigation").getByRole("link", { name: "Parts" }).click();
    await expect(page).toHaveURL(/\/parts$/);
    expect(problems).toEqual([]);
  });
}

test("no policy violation on the bench while editing, nor on the sign-in and error pages", async ({
  page,
}) => {
  const problems = await watch(page);
  await page.goto("/login");
  await page.waitForFunction(() => "__reactRouterRouteModules" in window);
  const missing = await page.goto("/no-such-page");
  expect(missing?.status()).toBe(404);
  await page.waitForFunction(() => "__reactRouterRouteModules" in window);
  // the browser reports the page's own 404 status; that one is expected
  expect(problems.splice(0)).toEqual([
    "Failed to load resource: the server responded with a status of 404 (Not Found)",
  ]);

  await loginAs(page, "builder");
  await page.goto(`/packages/${await freshPackage("Policy check package")}/bench`);
  // the bench takes input once its screen-reader status region is there (it runs)
  await expect(page.locator("[id^=DndLiveRegion]").first()).toBeAttached();
  const revision = page.getByTestId("revision");
  const before = Number((await revision.textContent())!.replace(/\D/g, ""));
  const revLimit = page.getByLabel("Rev limit");
  await revLimit.fill("6100");
  await revLimit.press("Enter");
  await expect(revision).toHaveText(`revision ${before + 1}`);
  expect(problems).toEqual([]);
});
