import { expect, test } from "@playwright/test";
import { loginAs } from "./support/login";

test("home page shows the shop in the product's look, with Barlow from the app's own assets", async ({
  page,
}) => {
  const fontRequests: string[] = [];
  page.on("request", (r) => {
    if (r.resourceType() === "font") fontRequests.push(r.url());
  });
  await loginAs(page, "owner");
  await page.goto("/");
  await expect(page.getByRole("link", { name: "Torquewright" })).toBeVisible();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Tallgrass Twin Works");
  await page.evaluate(() => document.fonts.ready);
  const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
  expect(family).toContain("Barlow");
  const loaded = await page.evaluate(() => document.fonts.check('16px "Barlow"'));
  expect(loaded).toBe(true);
  expect(fontRequests.length).toBeGreaterThan(0);
  for (const url of fontRequests) expect(new URL(url).host).toBe(new URL(page.url()).host);
  const headerBg = await page
    .locator("header")
    .evaluate((el) => getComputedStyle(el).backgroundColor);
  expect(headerBg).toBe("rgb(13, 27, 42)"); // ink #0d1b2a
});

test("an unknown address renders the 404 page in the same look", async ({ page }) => {
  const response = await page.goto("/no-such-page");
  expect(response?.status()).toBe(404);
  await expect(page.getByRole("heading", { name: "Page not found" })).toBeVisible();
  await expect(page.getByRole("link", { name: "Back to the home page" })).toBeVisible();
});

test("healthz answers ok from the database", async ({ request }) => {
  const res = await request.get("/healthz");
  expect(res.status()).toBe(200);
  expect(await res.json()).toEqual({ ok: true });
});
