import { expect, test } from "@playwright/test";
import { loginAs } from "./support/login";

test("the owner adds a part: a bad bore is refused beside its field, the rest is kept, the fix saves", async ({
  page,
}) => {
  const pn = `TW-E2E-${Date.now().toString(36).toUpperCase()}`;
  await loginAs(page, "owner");
  await page.goto("/parts/new");
  await page.getByLabel("Part number").fill(pn);
  await page.getByLabel("Category").selectOption("cylinders");
  await page.getByLabel("Maker").fill("Ironvale");
  await page.getByLabel("Name", { exact: true }).fill("Test bore pair");
  await page.getByLabel("Price ($)").fill("1199");
  const bore = page.getByLabel("Bore (mm)");
  await bore.fill("150");
  await page.getByRole("button", { name: "Add to the shelf" }).click();
  await expect(bore).toHaveAttribute("aria-invalid", "true");
  const describedBy = (await bore.getAttribute("aria-describedby")) ?? "";
  await expect(
    page.locator(`[id="${describedBy.split(" ").find((id) => id.endsWith("-error"))}"]`),
  ).toHaveText("Bore must be between 50 and 130 mm");
  await expect(page.getByLabel("Maker")).toHaveValue("Ironvale");
  await expect(page.getByLabel("Part number")).toHaveValue(pn);
  await bore.fill("104.8");
  await page.getByRole("button", { name: "Add to the shelf" }).click();
  await expect(page).toHaveURL(/\/parts\/\d+\?saved=1$/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText(pn);
  await expect(page.getByText("104.8 mm")).toBeVisible();
  const first = page.getByRole("complementary", { name: "History" }).getByRole("listitem").first();
  await expect(first).toContainText("v1");
  await expect(first).toContainText("Created");
  await expect(first).toContainText("First version.");
});

test("the owner writes a rule: a forbidden expression is refused with a message, a good one previews and saves", async ({
  page,
}) => {
  await loginAs(page, "owner");
  await page.goto("/rules/new");
  const form = page.locator("form#rule");
  await form.getByLabel("Name").fill(`Axle line e2e ${Date.now()}`);
  await form.getByLabel("Kind").selectOption("caution");
  const condition = form.getByLabel("Condition");
  await condition.fill('cylinder.constructor == 1 or import("fs")');
  await form.getByLabel("Message for the staff").fill("Check the adjusters.");
  await form.getByRole("button", { name: "Save rule" }).click();
  await expect(condition).toHaveAttribute("aria-invalid", "true");
  await expect(form.getByText(/"constructor" is not an attribute of cylinder/)).toBeVisible();
  await expect(form.getByLabel("Message for the staff")).toHaveValue("Check the adjusters.");
  await condition.fill('power_hp > 145 and has("stock-axle-adjusters")');
  await form.getByRole("button", { name: "Preview on saved packages" }).click();
  await expect(
    page.getByRole("heading", { name: /Preview against \d+ saved package/ }),
  ).toBeVisible();
  await expect(page.getByRole("heading", { name: /Would start flagging/ })).toBeVisible();
  await form.getByRole("button", { name: "Save rule" }).click();
  await expect(page).toHaveURL(/\/rules\/\d+\?saved=1$/);
  await expect(page.getByText("Saved as version 1.")).toBeVisible();
  await expect(page.getByText("First version.")).toBeVisible();
  // a second version: the history shows the condition's change in the same type as the code
  const edit = page.locator("form#rule");
  await edit.getByLabel("Condition").fill('power_hp > 150 and has("stock-axle-adjusters")');
  await edit.getByLabel("What changed and why (kept in the history)").fill("Line moved to 150 hp");
  await edit.getByRole("button", { name: "Save a new version" }).click();
  await expect(page.getByText("Saved as version 2.")).toBeVisible();
  const change = page.getByRole("region", { name: "History" }).getByRole("listitem").first();
  await expect(change).toContainText("Line moved to 150 hp");
  await expect(change.locator("ins", { hasText: "power_hp > 150" })).toHaveClass(/font-mono/);
  await expect(change.locator("del", { hasText: "power_hp > 145" })).toHaveClass(/font-mono/);
});

test("the owner checks a CSV file: the bad row is shown with its reason, and nothing is written", async ({
  page,
}) => {
  const stamp = Date.now().toString(36).toUpperCase();
  const good = `TW-E2E-IMP-${stamp}-A`;
  const bad = `TW-E2E-IMP-${stamp}-B`;
  const csv = [
    "part_number,category,maker,name,price,labour_hours,tags,stock,attributes,notes",
    `${good},cylinders,Ironvale,Good pair,1199,2,big-bore,no,boreMm=104.8,`,
    `${bad},cylinders,Ironvale,Oversize pair,1199,2,big-bore,no,boreMm=150,`,
  ].join("\n");
  await loginAs(page, "owner");
  await page.goto("/parts/import");
  await page
    .getByLabel("CSV file")
    .setInputFiles({ name: "parts.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByRole("button", { name: "Check the file" }).click();
  await expect(
    page.getByRole("heading", { name: "2 rows: 1 valid, 1 with problems" }),
  ).toBeVisible();
  const problem = page.getByRole("listitem").filter({ hasText: bad });
  await expect(problem).toContainText("Line 3");
  await expect(problem).toContainText("Bore must be between 50 and 130 mm");
  await expect(page.getByRole("listitem").filter({ hasText: good })).toHaveCount(0);
  await expect(page.getByRole("button", { name: /^Import/ })).toHaveCount(0);
  await page.goto(`/parts?q=${encodeURIComponent(`TW-E2E-IMP-${stamp}`)}&archived=1`);
  await expect(page.getByText("No part matches. Clear the search or the category.")).toBeVisible();
});
