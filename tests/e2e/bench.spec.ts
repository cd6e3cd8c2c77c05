// The spec bench in Chromium: drag parts with the mouse and with the keyboard, see the
// figures and a finding, reload to the saved state, and a stale save from a second tab.
import { expect, test, type Page } from "@playwright/test";
import { createDb } from "../../db/connect";
import { SLOT_BY_KEY } from "../../app/lib/packages/slots";
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

/** What the bench announces (and a screen reader says) while a card is lifted. */
const announced = (page: Page) => page.locator("[id^=DndLiveRegion]").first();
/** "… is over the cam slot." — the card is over a slot it fits (not "…, which it does not fit."). */
const overSlot = (slot: string) => `is over the ${SLOT_BY_KEY[slot]!.label.toLowerCase()} slot.`;

/**
 * Opens the bench and waits until it takes input: the bench's status region for screen
 * readers is only added once the page runs in the browser, and a drag or a pick before
 * that goes nowhere.
 */
async function openBench(page: Page, id: number) {
  await page.goto(`/packages/${id}/bench`);
  await expect(announced(page)).toBeAttached();
}

// The bench measures its slots and starts listening for keys just after a card is lifted,
// so every drop waits until the bench says the card is over the slot: a drop before that
// lands nowhere, as it would for a user who let go too soon.
async function drag(page: Page, partNumber: string, slot: string) {
  const card = page.getByTestId(`part-${partNumber}`);
  const target = page.getByTestId(`slot-${slot}`);
  await card.scrollIntoViewIfNeeded();
  const from = (await card.boundingBox())!;
  await page.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
  await page.mouse.down();
  await page.mouse.move(from.x + from.width / 2 + 10, from.y + from.height / 2 + 10, { steps: 3 });
  const to = (await target.boundingBox())!;
  await page.mouse.move(to.x + to.width / 2, to.y + to.height / 2, { steps: 8 });
  await expect(announced(page)).toContainText(overSlot(slot));
  await page.mouse.up();
  await expect(page.getByTestId(`slot-${slot}-part`)).toContainText(partNumber);
}

// The shelf first lists the whole catalog, the searched card among it; a search is done
// when the shelf shows only what matches, and not before: the list changes under the mouse.
async function search(page: Page, q: string) {
  await page.getByPlaceholder("Search number, name, tag…").fill(q);
  await expect(page.getByTestId("shelf-list").locator("li").filter({ hasNotText: q })).toHaveCount(
    0,
  );
  await expect(page.getByTestId(`part-${q}`)).toBeVisible();
}

test("a builder drags parts onto the slots, sees figures and a finding, and the save survives a reload", async ({
  page,
}) => {
  // a long journey (six drops, a reload, two widths: about 90 browser steps) on a shared machine
  test.setTimeout(60_000);
  const id = await freshPackage("E2E drag test");
  await loginAs(page, "builder");
  await page.setViewportSize({ width: 1440, height: 1000 });
  await openBench(page, id);
  const parts: [string, string][] = [
    ["TW-CYL-1016", "cylinder"],
    ["TW-FLY-1143", "flywheel"],
    ["TW-PST-1016", "piston"],
    ["TW-HD-0890", "head"],
    ["TW-HG-0991", "gasket"],
  ];
  for (const [number, slot] of parts) {
    await search(page, number);
    await drag(page, number, slot);
  }
  // the cam by keyboard only: focus the card, lift with Space, an arrow to its slot, Space to drop
  await search(page, "TW-CAM-585");
  await page.getByTestId("part-TW-CAM-585").focus();
  await page.keyboard.press("Space");
  await expect(announced(page)).toContainText("Picked up");
  // one arrow, pressed at once: the bench hears keys from the moment of the lift
  await page.keyboard.press("ArrowDown");
  await expect(announced(page)).toContainText(overSlot("cam"));
  await page.keyboard.press("Space");
  await expect(page.getByTestId("slot-cam-part")).toContainText("TW-CAM-585");
  await expect(announced(page)).toContainText("placed in the cam slot");

  await expect(page.getByTestId("result-displacementCi")).toContainText("113.");
  await expect(page.getByTestId("finding-conflict")).toContainText(
    "Head gasket bore smaller than the cylinder bore",
  );
  await expect(page.getByText("saving…")).toHaveCount(0);
  // the work shown is built in the browser from the saved spec
  await page.getByText("Show the work").click();
  await expect(page.getByTestId("work-steps")).toContainText("Displacement");
  await expect(page.getByTestId("work-steps")).toContainText("not computed");
  const revision = await page.getByTestId("revision").textContent();
  await page.screenshot({ path: `${SHOTS}/bench-1440.png`, fullPage: true });

  await page.reload();
  await expect(announced(page)).toBeAttached();
  await expect(page.getByTestId("revision")).toHaveText(revision!);
  await expect(page.getByTestId("slot-cam-part")).toContainText("TW-CAM-585");
  await expect(page.getByTestId("finding-conflict")).toBeVisible();

  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${SHOTS}/bench-390.png`, fullPage: true });
  // on a phone the figures come right after the engine and its numbers, before the chassis;
  // the strip of key figures stays in view while the builder works down the slots
  const top = async (testId: string) => (await page.getByTestId(testId).boundingBox())!.y;
  const results = (await page.getByRole("heading", { name: "Results" }).boundingBox())!.y;
  expect(results).toBeGreaterThan(await top("slot-flywheel"));
  expect(results).toBeLessThan(await top("slot-axle_adjusters"));
  await page.getByTestId("slot-piston").scrollIntoViewIfNeeded();
  await expect(page.getByTestId("bench-summary")).toBeInViewport();
  await expect(page.getByTestId("bench-summary")).toContainText("113.");
  await expect(page.getByTestId("bench-summary")).toContainText("1 conflict");
  await page.screenshot({ path: `${SHOTS}/bench-390-slots.png` });
});

test("two tabs on one package: the stale save is refused with what changed, and can be applied on top", async ({
  browser,
}) => {
  const id = await freshPackage("E2E two tabs");
  const a = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const b = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  await loginAs(a, "builder");
  await loginAs(b, "owner");
  const pa = await a.newPage();
  const pb = await b.newPage();
  await openBench(pa, id);
  await openBench(pb, id);
  await pa
    .getByTestId("slot-cylinder")
    .getByRole("combobox")
    .selectOption({ label: "TW-CYL-1048 · Big-bore cylinder pair, 104.8 mm" });
  await expect(pa.getByTestId("revision")).toHaveText("revision 2");
  await pb
    .getByTestId("slot-flywheel")
    .getByRole("combobox")
    .selectOption({ label: "TW-FLY-1175 · Stroker flywheel assembly, 117.5 mm" });
  const notice = pb.getByTestId("stale-notice");
  await expect(notice).toBeVisible();
  await expect(notice).toContainText("Bore (cylinders)");
  await expect(notice).toContainText("TW-CYL-1048");
  await pb.getByRole("button", { name: "Apply my change on top" }).click();
  await expect(pb.getByTestId("revision")).toHaveText("revision 3");
  await expect(pb.getByTestId("slot-flywheel-part")).toContainText("TW-FLY-1175");
  await expect(pb.getByTestId("slot-cylinder-part")).toContainText("TW-CYL-1048");
  await a.close();
  await b.close();
});

test("an impossible measured value is refused beside its slot, keeps what was typed, and saves nothing", async ({
  page,
  context,
}) => {
  const id = await freshPackage("E2E refused measurement");
  await loginAs(context, "builder");
  await openBench(page, id);
  await page
    .getByTestId("slot-head")
    .getByRole("combobox")
    .selectOption({ label: "TW-HD-0845 · Ported heads, 84.5 cc" });
  await expect(page.getByTestId("revision")).toHaveText("revision 2");
  const chamber = page.getByTestId("field-chamberCc");
  await chamber.getByRole("button", { name: "Enter measured" }).click();
  await chamber.getByRole("textbox").fill("-5");
  await chamber.getByRole("button", { name: "Save" }).click();
  await expect(chamber.getByRole("alert")).toContainText("negative");
  await expect(chamber.getByRole("textbox")).toHaveValue("-5");
  await expect(chamber.getByRole("textbox")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByTestId("revision")).toHaveText("revision 2");
  await page.reload();
  await expect(page.getByTestId("field-chamberCc")).toContainText("84.5 cc");
});
