import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD } from "../../db/seed/auth";
import { DEMO_STAFF } from "../../db/seed/core";
import { loginAs } from "./support/login";

const ROLE_LABEL = {
  owner: "Owner",
  builder: "Builder",
  service_writer: "Service writer",
  apprentice: "Apprentice",
} as const;

for (const person of DEMO_STAFF) {
  test(`${person.role} signs in with the password and signs out`, async ({ page }) => {
    await page.goto("/");
    await expect(page).toHaveURL(/\/login$/);
    await page.getByLabel("E-mail").fill(person.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page).toHaveURL(/\/$/);
    const who = page.getByLabel("Signed in as").filter({ visible: true });
    await expect(who).toContainText(person.name);
    await expect(who).toContainText(ROLE_LABEL[person.role]);
    const nav = page.getByRole("navigation", { name: "Main" }).filter({ visible: true });
    await expect(nav.getByRole("link", { name: "Staff" })).toHaveCount(
      person.role === "owner" ? 1 : 0,
    );

    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page).toHaveURL(/\/login$/);
    await page.goto("/");
    await expect(page).toHaveURL(/\/login$/);
  });
}

test("a wrong password shows the error and keeps the e-mail filled", async ({ page }) => {
  await page.goto("/login");
  await page.getByLabel("E-mail").fill("rui@tallgrass.test");
  await page.getByLabel("Password").fill("not-the-password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert")).toHaveText(
    "That e-mail and password do not match an active account.",
  );
  await expect(page.getByLabel("E-mail")).toHaveValue("rui@tallgrass.test");
  await expect(page.getByLabel("Password")).toHaveValue("");

  // the right password straight after works at the first click
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/$/);
  await expect(page.getByLabel("Signed in as").filter({ visible: true })).toContainText(
    "Rui Castellane",
  );
});

test("after signing in, the visitor lands where they were going", async ({ page }) => {
  await page.goto("/staff");
  await expect(page).toHaveURL(/\/login\?redirectTo=%2Fstaff$/);
  await page.getByLabel("E-mail").fill("dana@tallgrass.test");
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/staff$/);
  await expect(page.getByRole("heading", { name: "Staff", level: 1 })).toBeVisible();
});

test("a role without the page gets the 403 page in the product's look", async ({ page }) => {
  await loginAs(page, "apprentice");
  const res = await page.goto("/staff");
  expect(res?.status()).toBe(403);
  await expect(page.getByRole("heading", { name: "Not for your role" })).toBeVisible();
  await expect(page.getByText("Your role (apprentice) does not include this page")).toBeVisible();
});

test("the owner sees the staff list with every demo account", async ({ page }) => {
  await loginAs(page, "owner");
  await page.goto("/staff");
  for (const person of DEMO_STAFF)
    await expect(page.getByText(person.email, { exact: true })).toBeVisible();
});
