// The dyno log in Chromium: upload a run with the progress bar, see the chart and its
// peaks, overlay a second run, count it and see the axle rule's finding change; upload a
// build photo and see its thumbnail. Screenshots of the chart at 1440 and 390 px.
import { expect, test, type Page } from "@playwright/test";
import sharp from "sharp";
import { createDb } from "../../db/connect";
import { emptySpec } from "../../app/lib/bench/spec";
import { e2eDatabaseUrl } from "../support/db-url";
import { dryAirPressureKPa, sae1349Factor } from "../../calc";
import { fToC, inHgToKPa } from "../../app/lib/dyno/weather";
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
    const axle = await db
      .selectFrom("parts")
      .select("id")
      .where("part_number", "=", "TW-AX-STD")
      .executeTakeFirstOrThrow();
    const spec = emptySpec();
    spec.slots.axle_adjusters = { partId: axle.id, measured: {} };
    spec.powerHp = 120;
    spec.powerBasis = "target";
    return await createPackage(
      db,
      { name, bikeId: bike.id, isTemplate: false, builderId: builder.id, spec },
      builder.id,
    );
  } finally {
    await db.destroy();
  }
}

/** An invented sweep every 2 rpm (a few hundred KB, so the upload takes a moment). */
function sweep(peakLbFt: number, peakRpm: number, toRpm: number): Buffer {
  const lines = ["rpm,torque,power"];
  for (let rpm = 2500; rpm <= toRpm; rpm += 2) {
    const t = peakLbFt - 4 * ((rpm - peakRpm) / 1000) ** 2;
    lines.push(`${rpm},${t.toFixed(6)},${((t * rpm) / 5252).toFixed(3)}`);
  }
  return Buffer.from(lines.join("\n") + "\n");
}

async function uploadRun(
  page: Page,
  label: string,
  csv: Buffer,
  beforeSend: () => Promise<void> = async () => {},
) {
  await page.getByLabel("Run name").fill(label);
  await page.getByLabel("Air temperature").fill("77");
  await page.getByLabel("Barometric pressure").fill("29.92");
  await page.getByLabel("Relative humidity (%)").fill("40");
  await page.getByLabel("Run file (CSV, up to 10 MB)").setInputFiles({
    name: `${label}.csv`,
    mimeType: "text/csv",
    buffer: csv,
  });
  await beforeSend();
  await page.getByRole("button", { name: "Upload the run" }).click();
}

test("a run uploads with progress, is charted, overlaid, counted and changes a finding", async ({
  page,
  context,
}) => {
  const id = await freshPackage(`Dyno e2e ${Date.now()}`);
  await loginAs(page, "builder");
  await page.goto(`/packages/${id}/dyno`);
  await expect(page.getByRole("heading", { name: "Dyno log" })).toBeVisible();

  // a slow uplink, so the progress bar is seen filling
  const cdp = await context.newCDPSession(page);
  await uploadRun(page, "Before cam", sweep(120, 3600, 5800), async () => {
    await cdp.send("Network.enable");
    await cdp.send("Network.emulateNetworkConditions", {
      offline: false,
      latency: 0,
      downloadThroughput: -1,
      uploadThroughput: 150 * 1024,
    });
  });
  const bar = page.locator("progress#upload-progress");
  await expect(bar).toBeVisible();
  await expect.poll(async () => Number(await bar.getAttribute("value"))).toBeGreaterThan(0);
  await expect(page.getByRole("status").filter({ hasText: "Stored: 1651 points." })).toBeVisible({
    timeout: 20_000,
  });
  await cdp.send("Network.emulateNetworkConditions", {
    offline: false,
    latency: 0,
    downloadThroughput: -1,
    uploadThroughput: -1,
  });

  // the chart, both axes labelled in the user's units, and the peaks with their rpm
  const chart = page.getByTestId("dyno-chart");
  await expect(chart.getByRole("application")).toBeVisible();
  await expect(chart.getByText("Torque (lb·ft)")).toBeVisible();
  await expect(chart.getByText("Power (hp)")).toBeVisible();
  await expect(chart.getByText("Engine speed (rpm)")).toBeVisible();
  const peaks = page.getByTestId("peaks");
  // 77 °F, 29.92 inHg, 40 %: the factor calc/ gives for that air, shown on the run's card
  const tC = fToC(77);
  const factor = sae1349Factor({
    airTempC: tC,
    dryAirPressureKPa: dryAirPressureKPa(inHgToKPa(29.92), tC, 40),
  });
  await expect(
    page.getByText(`Corrected to SAE J1349 JUN1990: factor ${factor.toFixed(4)}`),
  ).toBeVisible();
  await expect(peaks.getByRole("row", { name: /Before cam \(corrected\)/ })).toContainText(
    /lb·ft at 3600 rpm/,
  );

  // a second run overlaid
  await uploadRun(page, "After cam", sweep(150, 4000, 6200));
  await expect(page.getByRole("status").filter({ hasText: "Stored: 1851 points." })).toBeVisible({
    timeout: 20_000,
  });
  await expect(peaks.getByRole("row")).toHaveCount(3);
  await expect(peaks.getByRole("row", { name: /After cam \(corrected\)/ })).toContainText(
    /lb·ft at 4000 rpm/,
  );
  await expect(chart.locator(".recharts-line")).toHaveCount(4);

  // counting the after-cam run: its measured power brings in the axle rule
  const measured = page.getByTestId("measured");
  await expect(measured).toContainText("None yet");
  const afterCard = page.locator("li", { has: page.getByRole("heading", { name: "After cam" }) });
  await afterCard.getByRole("button", { name: "Count this run" }).click();
  await expect(
    afterCard.getByRole("button", { name: /Counts for the measured figure/ }),
  ).toBeVisible();
  await expect(page.getByTestId("finding-changes")).toContainText(
    /measured, the rule “Stock rear-axle adjusters above 145 hp” now applies/,
  );
  await expect(measured).toContainText("in place of the spec's 120.0 hp (target)");

  await page.setViewportSize({ width: 1440, height: 900 });
  await chart.scrollIntoViewIfNeeded();
  await page.screenshot({ path: `${SHOTS}/dyno-1440.png`, fullPage: true });
  await page.setViewportSize({ width: 390, height: 844 });
  await expect(chart.getByRole("application")).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/dyno-390.png`, fullPage: true });
});

test("a build photo uploads and shows its thumbnail", async ({ page }) => {
  const id = await freshPackage(`Photo e2e ${Date.now()}`);
  await loginAs(page, "builder");
  await page.goto(`/packages/${id}`);
  const png = await sharp({
    create: { width: 900, height: 600, channels: 3, background: "#0f8b8d" },
  })
    .png()
    .toBuffer();
  const section = page.locator("#photos");
  await section.getByLabel("Caption").fill("Cam cover off");
  await section.getByLabel(/Photo \(JPEG, PNG or WebP/).setInputFiles({
    name: "cam.png",
    mimeType: "image/png",
    buffer: png,
  });
  await section.getByRole("button", { name: "Upload the photo" }).click();
  await expect(section.getByText("Photo stored.")).toBeVisible();
  const thumb = section.getByRole("img", { name: "Cam cover off" });
  await expect(thumb).toBeVisible();
  await expect
    .poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
    .toBe(360);
  await page.setViewportSize({ width: 1440, height: 900 });
  await section.scrollIntoViewIfNeeded();
  await page.screenshot({ path: `${SHOTS}/photos-1440.png` });
});
