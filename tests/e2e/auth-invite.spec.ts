// The owner invites a person; the e-mail goes through the queue to the local mail server,
// the owner finds it in /dev/outbox, and the person follows the link and is in.
import { expect, test } from "@playwright/test";
import { loginAs } from "./support/login";

test("an invite goes out by e-mail and its link creates the account", async ({ page, browser }) => {
  // npm test starts the local mail server and sets its address; without it this must fail,
  // not pass by skipping
  expect(process.env.LOCAL_MAIL_API_URL, "LOCAL_MAIL_API_URL (npm test sets it)").toMatch(
    /^http:\/\/127\.0\.0\.1:\d+$/,
  );
  const email = `bench-hand-${Date.now()}@tallgrass.test`;
  await loginAs(page, "owner");
  await page.goto("/staff");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Role", { exact: true }).selectOption("service_writer");
  await page.getByRole("button", { name: "Send invite" }).click();
  await expect(page.getByText(`Invite sent to ${email}.`)).toBeVisible();

  // the outbox is a local service, listed apart from the shop's own menu
  await page.getByRole("link", { name: "Outbox" }).filter({ visible: true }).first().click();
  await expect(page).toHaveURL(/\/dev\/outbox$/);
  const row = page.getByRole("row", { name: new RegExp(email.replace(/[.]/g, "\\.")) });
  await expect(async () => {
    await page.goto("/dev/outbox");
    await expect(row).toBeVisible({ timeout: 500 });
  }).toPass({ timeout: 20_000 });
  await row.getByRole("link").click();
  const link = page.getByRole("link", { name: /\/invite\// });
  const href = await link.getAttribute("href");
  expect(href).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/invite\/[\w.-]+$/);

  const invitee = await (await browser.newContext()).newPage();
  await invitee.goto(href!);
  await expect(invitee.getByText(email)).toBeVisible();
  await invitee.getByLabel("Your name").fill("Lark Amundsen");
  await invitee.getByLabel("Password", { exact: true }).fill("counter-stool-42");
  await invitee.getByLabel("Password again").fill("counter-stool-42");
  await invitee.getByRole("button", { name: "Create my account" }).click();
  await expect(invitee.getByLabel("Signed in as").filter({ visible: true })).toContainText(
    "Lark Amundsen",
  );
  await expect(invitee.getByLabel("Signed in as").filter({ visible: true })).toContainText(
    "Service writer",
  );

  await invitee.goto(href!);
  await expect(invitee.getByRole("alert")).toContainText("already been used");
});
