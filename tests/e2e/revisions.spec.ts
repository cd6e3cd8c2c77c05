// Revisions in Chromium: a builder's edits fold into one open revision, closing it with a
// note names it in the package's revision list with its edits folded under it, and a
// second tab's edit on a stale version is still refused.
import { expect, test, type Page } from "@playwright/test";
import { createDb } from "../../db/connect";
import { e2eDatabaseUrl } from "../support/db-url";
import { loginAs } from "./support/login";

const SHOTS = ".data/test-results/screenshots";

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

/** The bench takes input once its screen-reader status region exists (it runs in the browser). */
async function openBench(page: Page, id: number) {
  await page.goto(`/packages/${id}/bench`);
  await expect(page.locator("[id^=DndLiveRegion]").first()).toBeAttached();
}

async function pick(page: Page, slot: string, label: string) {
  await page.getByTestId(`slot-${slot}`).getByRole("combobox").selectOption({ label });
  await expect(page.getByText("saving…")).toHaveCount(0);
}

test("a builder's edits make one revision, closed with a note, listed with its edits folded under it", async ({
  page,
  context,
}) => {
  test.setTimeout(60_000);
  const id = await freshPackage("E2E revision note");
  await loginAs(context, "builder");
  await page.setViewportSize({ width: 1440, height: 1000 });
  await openBench(page, id);
  const state = page.getByTestId("revision-state");
  await pick(page, "cylinder", "TW-CYL-1048 · Big-bore cylinder pair, 104.8 mm");
  await expect(state).toContainText("Revision 2 is open · 1 edit");
  await pick(page, "flywheel", "TW-FLY-1175 · Stroker flywheel assembly, 117.5 mm");
  await pick(page, "head", "TW-HD-0845 · Ported heads, 84.5 cc");
  await expect(state).toContainText("Revision 2 is open · 3 edits");
  await expect(page.getByTestId("revision")).toHaveText("revision 2");

  const note = page.getByRole("textbox", { name: "Note for revision 2" });
  await page.getByRole("button", { name: "Close revision 2" }).click();
  await expect(page.getByText("Write a short note saying why")).toBeVisible();
  await expect(note).toHaveAttribute("aria-invalid", "true");
  await note.fill("Big bore and stroker, ported heads");
  await page.screenshot({ path: `${SHOTS}/revision-bar-1440.png` });
  await page.getByRole("button", { name: "Close revision 2" }).click();
  await expect(state).toContainText("Revision 2 is closed · your next edit opens revision 3");

  // the next edit opens revision 3
  await pick(page, "gasket", "TW-HG-0991 · Head gaskets, 99.1 mm × 1.02 mm (as delivered)");
  await expect(state).toContainText("Revision 3 is open · 1 edit");
  await expect(page.getByTestId("revision")).toHaveText("revision 3");

  await page.getByRole("link", { name: "All revisions" }).click();
  const r2 = page.getByTestId("revision-2");
  await expect(r2.getByTestId("revision-note")).toHaveText("“Big bore and stroker, ported heads”");
  await expect(r2).toContainText("closed with a note");
  // folded: the summary counts the edits, which show when unfolded
  const summary = r2.locator("summary");
  await expect(summary).toHaveText("3 edits");
  await expect(r2.getByTestId("edit-3")).toBeHidden();
  await summary.click();
  await expect(r2.getByTestId("edit-2")).toContainText("TW-CYL-1048");
  await expect(r2.getByTestId("edit-3")).toContainText("TW-FLY-1175");
  await expect(r2.getByTestId("edit-4")).toContainText("TW-HD-0845");
  await expect(page.getByTestId("revision-3")).toContainText("open");
  await expect(page.getByTestId("revision-1")).toContainText("starting point");
  await page.screenshot({ path: `${SHOTS}/revisions-1440.png`, fullPage: true });

  // compare a single edit with the one before it
  await r2.getByRole("link", { name: "Compare edit 3 with the one before" }).click();
  const compare = page.getByTestId("revision-compare");
  await expect(compare).toContainText("Edit 2 (revision 2) → edit 3 (revision 2)");
  await expect(compare).toContainText("TW-FLY-1175");

  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${SHOTS}/revisions-390.png`, fullPage: true });
});

test("a second tab's edit on a stale version is refused with what changed", async ({ browser }) => {
  const id = await freshPackage("E2E revision two tabs");
  const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  await loginAs(context, "builder");
  const first = await context.newPage();
  const second = await context.newPage();
  await openBench(first, id);
  await openBench(second, id);
  await pick(first, "cylinder", "TW-CYL-1048 · Big-bore cylinder pair, 104.8 mm");
  await second
    .getByTestId("slot-flywheel")
    .getByRole("combobox")
    .selectOption({ label: "TW-FLY-1175 · Stroker flywheel assembly, 117.5 mm" });
  const notice = second.getByTestId("stale-notice");
  await expect(notice).toBeVisible();
  await expect(notice).toContainText("saved edit 2");
  await expect(notice).toContainText("TW-CYL-1048");
  await second.getByRole("button", { name: "Apply my change on top" }).click();
  await expect(second.getByTestId("slot-flywheel-part")).toContainText("TW-FLY-1175");
  // the same builder in both tabs: both edits are in one revision
  await expect(second.getByTestId("revision-state")).toContainText("Revision 2 is open · 2 edits");
  await context.close();
});
