import { expect, test } from "@playwright/test";
import { loginAs } from "./support/login";

const SHOTS = ".data/test-results/screenshots";

test("the owner reads the caution limits with their defaults and sources; a bad value is named beside its field", async ({
  page,
}) => {
  await loginAs(page, "owner");
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.goto("/settings/limits");
  await expect(page.getByRole("heading", { level: 1, name: "Caution limits" })).toBeVisible();
  const mean = page.getByLabel("Mean piston speed, highest (m/s)");
  await expect(mean).toHaveValue("22.9");
  await expect(
    page.getByText(/Default 22\.9 m\/s — common practice: about 4500 ft\/min/),
  ).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/limits-1440.png`, fullPage: true });

  // nothing is saved: the quench window is checked in the browser and on the server
  await page.getByLabel("Quench, widest (mm)").fill("0.5");
  await page.getByRole("button", { name: "Save limits" }).click();
  await expect(page.getByText("Must be wider than the tightest quench.")).toBeVisible();
  await expect(page.getByLabel("Quench, widest (mm)")).toHaveAttribute("aria-invalid", "true");
  await expect(mean).toHaveValue("22.9");

  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${SHOTS}/limits-390.png`, fullPage: true });
});

test("a builder is refused the caution limits", async ({ page }) => {
  await loginAs(page, "builder");
  const response = await page.goto("/settings/limits");
  expect(response?.status()).toBe(403);
});
