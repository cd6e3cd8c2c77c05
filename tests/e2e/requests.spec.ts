// A rider asks for a build on the public form (one mistake, fixed), sees the thank-you
// page and gets the confirmation mail; the service writer finds and converts the request;
// the builder fills the package's slots; the keep-check shows keep, replace and review.
import { expect, test, type Browser, type Page } from "@playwright/test";
import { randomBytes } from "node:crypto";
import { createDb } from "../../db/connect";
import { e2eDatabaseUrl } from "../support/db-url";
import { mailFor } from "../support/mail";
import { loginAs } from "./support/login";

const SHOTS = ".data/test-results/screenshots";
const tag = randomBytes(3).toString("hex");
const email = `rider-${tag}@example.test`;
const riderName = `Ottilie Brackenridge ${tag}`;

async function shoot(page: Page, name: string) {
  for (const width of [1440, 390]) {
    await page.setViewportSize({ width, height: 900 });
    await page.screenshot({ path: `${SHOTS}/${name}-${width}.png`, fullPage: true });
  }
  await page.setViewportSize({ width: 1440, height: 900 });
}

async function signedIn(browser: Browser, role: "service_writer" | "builder") {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await loginAs(page, role);
  return page;
}

test.describe.serial("build request to keep-check", () => {
  test("a rider fixes one mistake, is thanked and gets the confirmation mail", async ({ page }) => {
    await page.goto("/build-request");
    await page.getByLabel("Name").fill(riderName);
    await page.getByLabel("E-mail").fill(`rider-${tag}-at-example.test`);
    await page.getByLabel("Phone").fill("555-0166");
    await page.getByLabel("How should we contact you?").selectOption("phone");
    await page.getByLabel("Model year").fill("2021");
    await page
      .getByLabel("Engine", { exact: true })
      .selectOption({ label: "Corvane large twin 114 (2017–2023)" });
    await page.getByLabel("Model", { exact: true }).fill("Longhaul LT, blue");
    await page.getByLabel("Mileage (miles)").fill("18400");
    await page
      .getByLabel("Parts that are not as the bike came (one a line)")
      .fill(
        "stock cylinders\nstock rear-axle adjusters\nadjustable shocks 13 in\naftermarket exhaust",
      );
    await page.getByLabel("What should the bike do?").fill("Passing power two-up, about 150 hp.");
    await page.getByLabel("Two-up").check();
    await page.getByLabel("Budget range").selectOption("over_15k");
    await page.getByLabel("When do you want it done?").selectOption("1_month");
    await page.getByLabel("You may contact me about this request the way I picked above.").check();
    await page.getByRole("button", { name: "Send the request" }).click();

    const emailError = page.getByText("Enter an e-mail address like name@example.com");
    await expect(emailError).toBeVisible();
    await expect(page.getByLabel("E-mail")).toHaveAttribute("aria-invalid", "true");
    await expect(page.getByLabel("Name")).toHaveValue(riderName);
    await expect(page).toHaveURL(/\/build-request$/);
    await shoot(page, "build-request-error");

    await page.getByLabel("E-mail").fill(email);
    await page.getByRole("button", { name: "Send the request" }).click();
    await expect(page).toHaveURL(/\/build-request\/thanks$/);
    await expect(
      page.getByRole("heading", { name: "Thank you — we have your request" }),
    ).toBeVisible();
    await expect(page.getByText("within two working days")).toBeVisible();
    await shoot(page, "build-request-thanks");

    const apiUrl = process.env.LOCAL_MAIL_API_URL;
    if (!apiUrl) throw new Error("LOCAL_MAIL_API_URL is not set (npm test sets it)");
    const mail = await mailFor(apiUrl, email, 20_000);
    expect(mail.subject).toBe("We have your build request — Tallgrass Twin Works");
    expect(mail.text).toContain("On it now: stock cylinders; stock rear-axle adjusters");
  });

  test("the service writer converts it; the builder fills slots; the keep-check marks the parts", async ({
    browser,
  }) => {
    const writer = await signedIn(browser, "service_writer");
    await writer.goto("/requests");
    await writer.getByRole("link", { name: riderName }).click();
    await expect(writer.getByRole("heading", { name: new RegExp(riderName) })).toBeVisible();
    await expect(writer.getByText("No customer on file has this e-mail or phone.")).toBeVisible();
    const pick = async (i: number, label: string) =>
      writer.locator(`select[name="parts[${i}].partId"]`).selectOption({ label });
    await pick(0, "TW-CYL-1016 Cylinder pair, 101.6 mm (as delivered, large twin)");
    await pick(1, "TW-AX-STD Rear-axle adjusters (as delivered)");
    await pick(2, "TW-SH-13 Adjustable rear shocks, 13 in");
    await writer.locator('select[name="parts[3].category"]').selectOption("exhaust");
    await writer.getByLabel("Builder").selectOption({ label: "Rui Castellane" });
    await shoot(writer, "request-convert");
    await writer.getByRole("button", { name: "Convert and open a draft package" }).click();
    await expect(writer).toHaveURL(/\/packages\/\d+$/);
    const packageId = Number(new URL(writer.url()).pathname.split("/").pop());

    const builder = await signedIn(browser, "builder");
    await builder.goto(`/packages/${packageId}/bench`);
    await builder
      .getByTestId("slot-cylinder")
      .getByRole("combobox")
      .selectOption({ label: "TW-CYL-1048 · Big-bore cylinder pair, 104.8 mm" });
    // the builder's edits fold into the one open revision: two edits, both saved
    await expect(builder.getByTestId("revision-state")).toContainText(
      "Revision 2 is open · 1 edit",
    );
    const power = builder.getByLabel("Power in hp");
    await power.fill("150");
    await power.press("Enter");
    await expect(builder.getByTestId("revision-state")).toContainText(
      "Revision 2 is open · 2 edits",
    );

    await writer.goto(`/packages/${packageId}/keep-check`);
    const row = (text: string) => writer.getByTestId("keep-row").filter({ hasText: text });
    await expect(row("TW-CYL-1016").getByTestId("mark")).toHaveText("Replace");
    await expect(row("TW-CYL-1016")).toContainText("The package puts TW-CYL-1048");
    await expect(row("TW-AX-STD").getByTestId("mark")).toHaveText("Replace");
    await expect(row("TW-AX-STD")).toContainText(
      "Fit rule “Stock rear-axle adjusters above 145 hp”",
    );
    await expect(row("TW-SH-13").getByTestId("mark")).toHaveText("Keep");
    await expect(row("aftermarket exhaust").getByTestId("mark")).toHaveText("Review");
    await expect(row("aftermarket exhaust")).toContainText("Not a catalog part");
    await shoot(writer, "keep-check");

    const db = createDb(e2eDatabaseUrl(), 1);
    try {
      const bike = await db
        .selectFrom("build_requests")
        .select(["status", "bike_id"])
        .where("email", "=", email)
        .executeTakeFirstOrThrow();
      expect(bike.status).toBe("converted");
    } finally {
      await db.destroy();
    }
  });
});
