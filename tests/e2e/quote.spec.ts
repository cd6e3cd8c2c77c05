// The quote's whole path in Chromium: the service writer sends the quote, the customer
// opens the e-mailed link, is declined once on the local payment service's checkout page,
// pays, and the package shows approved; the spec sheet is rendered and its PDF read back.
import { expect, test } from "@playwright/test";
import { PDFParse } from "pdf-parse";
import { createDb } from "../../db/connect";
import { e2eDatabaseUrl } from "../support/db-url";
import { E2E_BASE, loginAs } from "./support/login";

const SHOTS = ".data/test-results/screenshots";

/** A draft demo package with a customer who has an e-mail address. */
async function draftPackage(): Promise<{ id: number; name: string; email: string }> {
  const db = createDb(e2eDatabaseUrl(), 1);
  try {
    return (await db
      .selectFrom("packages as p")
      .innerJoin("bikes as b", "b.id", "p.bike_id")
      .innerJoin("customers as c", "c.id", "b.customer_id")
      .select(["p.id", "p.name", "c.email"])
      .where("p.status", "=", "draft")
      .where("p.is_template", "=", false)
      .where("c.email", "is not", null)
      .orderBy("p.id")
      .executeTakeFirstOrThrow()) as { id: number; name: string; email: string };
  } finally {
    await db.destroy();
  }
}

async function anyPackage(): Promise<{ id: number; name: string }> {
  const db = createDb(e2eDatabaseUrl(), 1);
  try {
    return await db
      .selectFrom("packages")
      .select(["id", "name"])
      .where("is_template", "=", false)
      // a delivered package: no other test changes it while this one reads it
      .where("status", "=", "delivered")
      .orderBy("id")
      .executeTakeFirstOrThrow();
  } finally {
    await db.destroy();
  }
}

async function quoteLinkFor(email: string): Promise<string> {
  const api = process.env.LOCAL_MAIL_API_URL;
  if (!api) throw new Error("LOCAL_MAIL_API_URL is not set: npm test starts the local mail server");
  let link = "";
  await expect
    .poll(
      async () => {
        const list = (await (await fetch(`${api}/messages`)).json()) as {
          id: string;
          to: string[];
          subject: string;
        }[];
        const m = list.find(
          (x) => x.to.includes(email) && x.subject.startsWith("Your engine package quote"),
        );
        if (!m) return "";
        const full = (await (await fetch(`${api}/messages/${m.id}`)).json()) as { text: string };
        link = /https?:\/\/\S+\/q\/\S+/.exec(full.text)?.[0] ?? "";
        return link;
      },
      { timeout: 30_000, message: "the quote e-mail reaches the local mail server" },
    )
    .not.toBe("");
  return link;
}

test("send, open the link, a declined card, pay the deposit, approved", async ({
  page,
  browser,
}) => {
  const pkg = await draftPackage();
  await loginAs(page, "service_writer");
  await page.setViewportSize({ width: 1440, height: 1000 });
  await page.goto(`/packages/${pkg.id}/quote`);
  await expect(page.getByRole("heading", { name: "The quote as it stands" })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/quote-1440.png`, fullPage: true });
  await page.getByRole("button", { name: "Send the quote" }).click();
  await expect(page.getByText(`Quote 1 sent to ${pkg.email}.`)).toBeVisible();
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${SHOTS}/quote-390.png`, fullPage: true });

  const link = await quoteLinkFor(pkg.email);
  expect(link.startsWith(`${E2E_BASE}/q/`)).toBe(true);

  const customer = await browser.newPage({ viewport: { width: 390, height: 844 } });
  await customer.goto(link);
  await expect(customer.getByRole("heading", { name: `Quote 1: ${pkg.name}` })).toBeVisible();
  await customer.screenshot({ path: `${SHOTS}/customer-quote-390.png`, fullPage: true });
  await customer
    .getByRole("button", { name: /^Approve and pay the \$[\d,]+\.\d\d deposit$/ })
    .click();
  await expect(customer.getByRole("heading", { name: "Test checkout" })).toBeVisible();
  await customer.getByRole("button", { name: "Pay with a card that is declined" }).click();
  await expect(customer.getByRole("alert")).toHaveText(
    "Your card was declined. Try another card or cancel.",
  );
  await customer.getByRole("button", { name: /^Pay \$/ }).click();
  await expect(customer).toHaveURL(/\/q\/.+\?deposit=paid$/);
  // the payment service's webhook records the deposit; the page shows it once it has
  await expect
    .poll(
      async () => {
        await customer.reload();
        return customer.getByText("Your deposit is paid.", { exact: false }).count();
      },
      { timeout: 30_000, message: "the deposit is recorded from the webhook" },
    )
    .toBe(1);
  await customer.setViewportSize({ width: 1440, height: 1000 });
  await customer.screenshot({ path: `${SHOTS}/customer-quote-1440.png`, fullPage: true });
  await customer.close();

  await page.goto(`/packages/${pkg.id}/quote`);
  await expect(page.getByText(/— paid$/)).toBeVisible();
  await page.goto(`/packages/${pkg.id}`);
  await expect(page.getByTestId("status").first()).toHaveText(/^approved$/i);
});

test("the spec sheet prints and its PDF carries the package's numbers", async ({ page }) => {
  const pkg = await anyPackage();
  await loginAs(page, "builder");
  await page.setViewportSize({ width: 1440, height: 1000 });
  await page.goto(`/packages/${pkg.id}/sheet`);
  await expect(page.getByRole("heading", { name: `Spec sheet: ${pkg.name}` })).toBeVisible();
  const displacement = page.getByRole("row", { name: /^Displacement/ });
  const inchText = (await displacement.locator("td").first().textContent()) ?? "";
  expect(inchText).toMatch(/^\d+\.\d ci$/);
  await page.emulateMedia({ media: "print" });
  await page.screenshot({ path: `${SHOTS}/sheet-print-1440.png`, fullPage: true });
  await page.emulateMedia({ media: "screen" });
  const res = await page.request.get(`/packages/${pkg.id}/sheet.pdf`);
  expect(res.headers()["content-type"]).toBe("application/pdf");
  const text = (
    await new PDFParse({ data: new Uint8Array(await res.body()) }).getText()
  ).text.replace(/\s+/g, " ");
  expect(text).toContain(pkg.name);
  expect(text).toContain(`Displacement ${inchText}`);
  expect(text).toContain("Torque every fastener to the parts maker's instructions");
});
