// The dyno log and build photos: run files parsed and corrected with calc/'s SAE J1349
// function, peaks and the power band, and uploads through the routes' own actions against
// the real local S3 fake (scripts/services/s3-fake.ts, started by scripts/test.sh) and the
// test database — limits, byte-level type checks, role checks on downloads, and no object
// or row left behind by a refused or failed upload.
import { randomBytes } from "node:crypto";
import sharp from "sharp";
import { sql } from "kysely";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createPackage, evaluateSpec } from "~/lib/packages/store.server";
import { createRule } from "~/lib/fit-rules/rules.server";
import { emptySpec } from "~/lib/bench/spec";
import { listKeys } from "~/lib/storage/storage.server";
import {
  MAX_RUN_ROWS,
  RunParser,
  correctionFor,
  peakOf,
  powerBand,
  type CurvePoint,
} from "~/lib/dyno/run";
import { readMeasured } from "~/lib/dyno/measured.server";
import { measuredEffect } from "~/lib/dyno/findings.server";
import { action as uploadAction } from "~/routes/packages.$id.dyno.upload";
import { action as dynoAction, loader as dynoLoader } from "~/routes/packages.$id.dyno";
import { action as photoAction } from "~/routes/packages.$id.photos";
import { action as photoChange } from "~/routes/packages.$id.photos.$photoId";
import { loader as fileLoader } from "~/routes/files.$id";
import { SAE_J1349_REVISION, dryAirPressureKPa, kwToHp, nmToLbFt, sae1349Factor } from "../../calc";
import { createTestUser, requestAs, signedOutRequest, type TestUser } from "../support/auth";

const db = getDb();
const tag = randomBytes(4).toString("hex");
let builder: TestUser;
let writer: TestUser;
let apprentice: TestUser;
let packageId = 0;
let photoPackageId = 0;
let axleStockId = 0;

const call = <T>(fn: (args: never) => T, request: Request, params: Record<string, string>) =>
  fn({ request, params, context: {} } as never);

async function settle(p: unknown): Promise<Response> {
  try {
    const v = await p;
    if (v instanceof Response) return v;
    const d = v as { init?: { status?: number }; data?: unknown };
    return Response.json(d.data ?? v, { status: d.init?.status ?? 200 });
  } catch (thrown) {
    if (thrown instanceof Response) return thrown;
    const d = thrown as { init?: { status?: number }; data?: unknown };
    if (d && typeof d === "object" && "init" in d)
      return Response.json(d.data, { status: d.init?.status ?? 500 });
    throw thrown;
  }
}

/** A synthetic sweep: torque (lb·ft) rising then falling; power written by hp = T·rpm/5252. */
function sweepCsv(peakLbFt: number, opts: { from?: number; to?: number; step?: number } = {}) {
  const lines = ["RPM,Torque (lb-ft),Power (hp)"];
  for (let rpm = opts.from ?? 2000; rpm <= (opts.to ?? 6000); rpm += opts.step ?? 100) {
    const t = peakLbFt - ((rpm - 3600) / 1000) ** 2 * 8;
    lines.push(`${rpm},${t.toFixed(2)},${((t * rpm) / 5252).toFixed(2)}`);
  }
  return lines.join("\n") + "\n";
}

function runForm(
  file: Blob | null,
  fields: Record<string, string> = {},
  name = "run.csv",
): FormData {
  const f = new FormData();
  const all = { label: "baseline", torqueUnit: "lbft", powerUnit: "hp", ...fields };
  for (const [k, v] of Object.entries(all)) f.set(k, v);
  if (file) f.set("file", file, name);
  return f;
}

async function postRun(pkg: number, form: FormData, who: TestUser = builder) {
  const req = await requestAs(who, `/packages/${pkg}/dyno/upload`, { method: "POST", body: form });
  const res = await settle(call(uploadAction, req, { id: String(pkg) }));
  return { status: res.status, body: (await res.json()) as any };
}

async function postPhoto(pkg: number, file: Blob, name: string) {
  const f = new FormData();
  f.set("caption", "Top end");
  f.set("file", file, name);
  const req = await requestAs(builder, `/packages/${pkg}/photos`, { method: "POST", body: f });
  const res = await settle(call(photoAction, req, { id: String(pkg) }));
  return { status: res.status, body: (await res.json()) as any };
}

async function stored(pkg: number) {
  const [keys, files, runs, photos] = await Promise.all([
    listKeys(`packages/${pkg}/`),
    db.selectFrom("stored_files").select("id").where("package_id", "=", pkg).execute(),
    db.selectFrom("dyno_runs").select("id").where("package_id", "=", pkg).execute(),
    db.selectFrom("package_photos").select("id").where("package_id", "=", pkg).execute(),
  ]);
  return { keys: keys.length, files: files.length, runs: runs.length, photos: photos.length };
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [builder, writer, apprentice] = await Promise.all([
    createTestUser(db, "builder"),
    createTestUser(db, "service_writer"),
    createTestUser(db, "apprentice"),
  ]);
  const c = await db
    .insertInto("customers")
    .values({ name: `Dyno ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const bike = await db
    .insertInto("bikes")
    .values({ customer_id: c.id, year: 2020, model: `Dyno twin ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  axleStockId = (
    await db
      .insertInto("parts")
      .values({
        part_number: `AX-${tag}`,
        category: "axle_adjusters",
        maker: "Test Works",
        name: "Stock adjusters",
        price_cents: 0,
        tags: [`stock-axle-${tag}`],
        stock: true,
        attributes: JSON.stringify({}),
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  const made = await createRule(
    db,
    {
      name: `Axle above 145 hp ${tag}`,
      kind: "upgrade",
      condition: `power_hp > 145 and has("stock-axle-${tag}")`,
      message: "Upgrade the rear-axle adjusters.",
      upgrade_category: "axle_adjusters",
      suggested_part_id: null,
      active: true,
    },
    null,
  );
  if (!made.ok) throw new Error("rule fixture did not save");
  const spec = emptySpec();
  spec.slots.axle_adjusters = { partId: axleStockId, measured: {} };
  spec.powerHp = 130;
  spec.powerBasis = "target";
  packageId = await createPackage(
    db,
    { name: `Dyno pkg ${tag}`, bikeId: bike.id, isTemplate: false, builderId: builder.id, spec },
    builder.id,
  );
  photoPackageId = await createPackage(
    db,
    { name: `Photo pkg ${tag}`, bikeId: bike.id, isTemplate: false, builderId: builder.id },
    builder.id,
  );
});

describe("correction to standard conditions (calc/'s SAE J1349 function)", () => {
  it("is exactly 1 at the standard's reference conditions, 25 °C and 99 kPa dry air", () => {
    // SAE J1349 JUN1990, reference conditions: 25 °C, 99 kPa dry-air pressure. Dry air
    // means no water vapour: 0 % humidity at 99 kPa barometric.
    const c = correctionFor({ airTempC: 25, baroKPa: 99, humidityPct: 0 });
    expect(c).toEqual({ ok: true, factor: 1, standard: SAE_J1349_REVISION, dryAirKPa: 99 });
  });

  it("is calc's factor on the dry-air pressure for any weather", () => {
    const w = { airTempC: 31, baroKPa: 97.2, humidityPct: 48 };
    const c = correctionFor(w);
    const pd = dryAirPressureKPa(97.2, 31, 48);
    expect(c.ok && c.factor).toBe(sae1349Factor({ airTempC: 31, dryAirPressureKPa: pd }));
    expect(c.ok && c.factor).toBeGreaterThan(1);
  });

  it("says which weather is missing instead of correcting", () => {
    expect(correctionFor({ airTempC: 20, baroKPa: null, humidityPct: null })).toEqual({
      ok: false,
      missing: ["barometric pressure", "humidity"],
    });
  });
});

describe("parsing a run file and finding its peaks", () => {
  const parse = (csv: string, units = { torque: "lbft" as const, power: "hp" as const }) => {
    const p = new RunParser(units);
    csv.split("\n").forEach((line, i) => p.row(line === "" ? [""] : line.split(","), i + 1));
    return p;
  };

  it("lb·ft and hp curves cross at 5,252 rpm (hp = lb·ft × rpm / 5252)", () => {
    // The published identity hp = lb·ft × rpm / 5252 (5252 = 33,000 / 2π, rounded): from a
    // torque-only file, the power the parser derives equals the torque at 5,252 rpm.
    const lines = ["rpm,torque"];
    for (let rpm = 4000; rpm <= 6500; rpm += 4) lines.push(`${rpm},${120 - (rpm - 4000) / 100}`);
    const p = parse(lines.join("\n"));
    expect(p.refusal(false)).toBeNull();
    const hp = (pt: CurvePoint) => kwToHp(pt.powerKw);
    const lbft = (pt: CurvePoint) => nmToLbFt(pt.torqueNm);
    const at = p.points.find((pt) => pt.rpm === 5252)!;
    expect(hp(at)).toBeCloseTo(lbft(at), 2);
    const below = p.points.filter((pt) => pt.rpm < 5252);
    const above = p.points.filter((pt) => pt.rpm > 5252);
    expect(below.length).toBeGreaterThan(100);
    expect(above.length).toBeGreaterThan(100);
    expect(below.every((pt) => hp(pt) < lbft(pt))).toBe(true);
    expect(above.every((pt) => hp(pt) > lbft(pt))).toBe(true);
  });

  it("finds peak power and peak torque with their rpm", () => {
    const p = parse(sweepCsv(110));
    const tq = peakOf(p.points, "torqueNm")!;
    const pw = peakOf(p.points, "powerKw")!;
    expect(tq.rpm).toBe(3600);
    expect(nmToLbFt(tq.value)).toBeCloseTo(110, 6);
    // P ∝ rpm·(110 − 8·x²/10⁶), x = rpm − 3600: dP/drpm = 0 at 24x² + 57,600x − 110·10⁶ = 0,
    // x ≈ 1,254 → 4,854 rpm; of the logged rpm (every 100), 4,900 is the highest
    expect(pw.rpm).toBe(4900);
  });

  it("integrates the power curve between two rpm (trapezoid rule)", () => {
    // constant 50 kW: area = 50 × 1000 kW·rpm, average 50 kW, interpolated ends included
    const flat: CurvePoint[] = [2000, 2500, 3000, 3500, 4000].map((rpm) => ({
      rpm,
      powerKw: 50,
      torqueNm: 0,
    }));
    expect(powerBand(flat, 2250, 3250)).toEqual({
      fromRpm: 2250,
      toRpm: 3250,
      areaKwRpm: 50_000,
      averageKw: 50,
    });
    // a ramp P = rpm/100: the exact integral from 2000 to 4000 is (4000² − 2000²)/200
    const ramp = flat.map((p) => ({ ...p, powerKw: p.rpm / 100 }));
    expect(powerBand(ramp, 2000, 4000)!.areaKwRpm).toBe(60_000);
    expect(powerBand(ramp, 1500, 4000)).toBeNull();
  });

  it("lists bad rows with their line numbers", () => {
    const p = parse(
      "rpm,torque\n2000,80\n2100,eighty\n2200,82\n2150,83\n2150,84\n2400,85\n2500,86\n2600,87",
    );
    expect(p.badRows).toEqual([
      { line: 3, message: 'torque "eighty" is not a number' },
      { line: 5, message: "rpm goes backwards (2150 after 2200)" },
      // checked against the last good row, 2200
      { line: 6, message: "rpm goes backwards (2150 after 2200)" },
    ]);
    const q = parse("rpm,torque\n2000,80\n2000,81\n2100,82\n2200,82\n2300,82\n2400,85");
    expect(q.badRows).toEqual([{ line: 3, message: "rpm 2000 repeats the row before" }]);
  });
});

describe("uploading a run (real S3 fake, real database)", () => {
  it("stores a good run: object, SHA-256, points observed and corrected", async () => {
    const csv = sweepCsv(140);
    const before = await stored(packageId);
    const r = await postRun(
      packageId,
      runForm(new Blob([csv], { type: "text/csv" }), {
        label: `baseline ${tag}`,
        runDate: "2026-11-20",
        gear: "4",
        tempUnit: "F",
        airTemp: "86",
        baroUnit: "inhg",
        baro: "29.60",
        humidity: "40",
      }),
    );
    expect(r.status).toBe(201);
    expect(r.body.points).toBe(41);
    const after = await stored(packageId);
    expect(after).toEqual({
      ...before,
      keys: before.keys + 1,
      files: before.files + 1,
      runs: before.runs + 1,
    });
    const run = await db
      .selectFrom("dyno_runs as r")
      .innerJoin("stored_files as f", "f.id", "r.file_id")
      .select([
        "r.correction_factor",
        "r.correction_standard",
        "f.sha256",
        "f.byte_size",
        "f.id as file_id",
      ])
      .where("r.id", "=", r.body.runId)
      .executeTakeFirstOrThrow();
    const { createHash } = await import("node:crypto");
    expect(run.sha256).toBe(createHash("sha256").update(csv).digest("hex"));
    expect(run.byte_size).toBe(Buffer.byteLength(csv));
    expect(run.correction_standard).toBe("SAE J1349 JUN1990");
    const tC = ((86 - 32) * 5) / 9;
    const pd = dryAirPressureKPa(29.6 * 3.386389, tC, 40);
    expect(run.correction_factor).toBeCloseTo(
      sae1349Factor({ airTempC: tC, dryAirPressureKPa: pd }),
      4,
    );
    const pts = await db
      .selectFrom("dyno_points")
      .selectAll()
      .where("run_id", "=", r.body.runId)
      .orderBy("seq")
      .execute();
    expect(pts).toHaveLength(41);
    expect(pts[0]!.line).toBe(2);
    expect(pts[0]!.power_kw_corrected).toBeCloseTo(pts[0]!.power_kw * run.correction_factor!, 9);

    // the download: the service writer reads it through our route; the apprentice may not
    const asWriter = await settle(
      call(fileLoader, await requestAs(writer, `/files/${run.file_id}`), {
        id: String(run.file_id),
      }),
    );
    expect(asWriter.status).toBe(200);
    expect(asWriter.headers.get("Content-Disposition")).toBe('attachment; filename="run.csv"');
    expect(await asWriter.text()).toBe(csv);
    const asApprentice = await settle(
      call(fileLoader, await requestAs(apprentice, `/files/${run.file_id}`), {
        id: String(run.file_id),
      }),
    );
    expect(asApprentice.status).toBe(403);
    const signedOut = await settle(
      call(fileLoader, signedOutRequest(`/files/${run.file_id}`), { id: String(run.file_id) }),
    );
    expect(signedOut.status).toBe(302);
  });

  const refusals: [string, () => FormData, number, RegExp][] = [
    [
      "wrong columns",
      () => runForm(new Blob(["speed,force\n1,2\n"]), {}),
      422,
      /^The first row must name an rpm column and a torque and\/or power column .* "speed", "force"\.$/,
    ],
    [
      "text in a number column",
      () => runForm(new Blob([sweepCsv(120).replace("2300,", "2300x,")])),
      422,
      /^1 row is not usable \(listed below\)\. Nothing was stored\./,
    ],
    [
      "rpm going backwards",
      () =>
        runForm(new Blob(["rpm,torque\n3000,90\n2900,91\n2800,92\n2700,93\n2600,94\n2500,95\n"])),
      422,
      /^5 rows are not usable/,
    ],
    [
      "a single row",
      () => runForm(new Blob(["rpm,torque,power\n3000,100,57.1\n"])),
      422,
      /^The file has 1 row of figures; a run needs at least 5\.$/,
    ],
    [
      "2 million rows",
      () => runForm(new Blob(["rpm,torque\n", "1,1\n".repeat(2_000_000)])),
      422,
      new RegExp(`^The file has more than ${MAX_RUN_ROWS.toLocaleString("en-US")} rows`),
    ],
    [
      "a 50 MB file",
      () => runForm(new Blob([new Uint8Array(50 * 1024 * 1024).fill(0x31)])),
      413,
      /^The run file is larger than 10 MB; nothing was stored\.$/,
    ],
    [
      "a PDF renamed .csv",
      () => runForm(new Blob(["%PDF-1.7\n%\u00e2\u00e3\n1 0 obj\n<<>>\nendobj\n"])),
      415,
      /^This file is PDF data \(application\/pdf\), not a CSV text file; nothing was stored\.$/,
    ],
  ];
  for (const [what, make, status, message] of refusals) {
    it(`refuses ${what}, storing nothing`, async () => {
      const before = await stored(packageId);
      const r = await postRun(packageId, make());
      expect(r.status).toBe(status);
      expect(r.body.ok).toBe(false);
      expect(r.body.message).toMatch(message);
      expect(await stored(packageId)).toEqual(before);
    });
  }

  it("shows the first bad rows by line and stores the rest when the user accepts dropping them", async () => {
    const csv = sweepCsv(120).replace("2300,", "2300x,").replace("2500,", "2450,");
    const first = await postRun(packageId, runForm(new Blob([csv])));
    expect(first.status).toBe(422);
    expect(first.body.badRows).toEqual([{ line: 5, message: 'rpm "2300x" is not a number' }]);
    const before = await stored(packageId);
    const again = await postRun(
      packageId,
      runForm(new Blob([csv]), { label: "dropped", dropBad: "on" }),
    );
    expect(again.status).toBe(201);
    expect(again.body).toMatchObject({ ok: true, points: 40, dropped: 1 });
    expect((await stored(packageId)).runs).toBe(before.runs + 1);
    // a run without weather is kept uncorrected and cannot count
    const r = await db
      .selectFrom("dyno_runs")
      .selectAll()
      .where("id", "=", again.body.runId)
      .executeTakeFirstOrThrow();
    expect(r.correction_factor).toBeNull();
    const mark = await settle(
      call(
        dynoAction,
        await requestAs(builder, `/packages/${packageId}/dyno`, {
          method: "POST",
          body: new URLSearchParams({ intent: "counts", runId: String(r.id), counts: "true" }),
        }),
        { id: String(packageId) },
      ),
    );
    expect(mark.status).toBe(400);
    expect((await mark.json()).message).toMatch(/^A run without its weather cannot count/);
  });

  it("puts back nothing when the database refuses the run after its object went in", async () => {
    await sql`create or replace function dyno_test_refuse() returns trigger language plpgsql as $$
      begin if new.label like 'refuse-%' then raise exception 'refused by test trigger'; end if; return new; end $$`.execute(
      db,
    );
    await sql`create trigger dyno_test_refuse before insert on dyno_runs for each row execute function dyno_test_refuse()`.execute(
      db,
    );
    try {
      const before = await stored(packageId);
      await expect(
        postRun(packageId, runForm(new Blob([sweepCsv(120)]), { label: `refuse-${tag}` })),
      ).rejects.toThrow(/refused by test trigger/);
      expect(await stored(packageId)).toEqual(before);
    } finally {
      await sql`drop trigger dyno_test_refuse on dyno_runs`.execute(db);
    }
  });

  it("refuses a service writer's or apprentice's upload", async () => {
    for (const who of [writer, apprentice]) {
      const req = await requestAs(who, `/packages/${packageId}/dyno/upload`, {
        method: "POST",
        body: runForm(new Blob([sweepCsv(120)])),
      });
      expect((await settle(call(uploadAction, req, { id: String(packageId) }))).status).toBe(403);
    }
  });
});

describe("the measured figure feeds the fit rules", () => {
  it("counts a corrected run: its peaks replace the spec's power and the axle rule applies", async () => {
    const spec = (
      await db
        .selectFrom("packages")
        .select("spec")
        .where("id", "=", packageId)
        .executeTakeFirstOrThrow()
    ).spec;
    const ruleName = `Axle above 145 hp ${tag}`;
    const without = await evaluateSpec(db, spec, false);
    expect(without.findings.map((f) => f.ruleName)).not.toContain(ruleName);

    const up = await postRun(
      packageId,
      runForm(new Blob([sweepCsv(170)]), {
        label: `after cam ${tag}`,
        tempUnit: "C",
        airTemp: "25",
        baroUnit: "kpa",
        baro: "99",
        humidity: "0",
      }),
    );
    expect(up.status).toBe(201);
    const res = await settle(
      call(
        dynoAction,
        await requestAs(builder, `/packages/${packageId}/dyno`, {
          method: "POST",
          body: new URLSearchParams({
            intent: "counts",
            runId: String(up.body.runId),
            counts: "true",
          }),
        }),
        { id: String(packageId) },
      ),
    );
    expect(res.status).toBe(200);
    const measured = await readMeasured(db, packageId);
    // factor exactly 1 at the reference conditions: the corrected peak is the observed one.
    // T = 170 − 8·x²/10⁶: peak power where 24x² + 57,600x − 170·10⁶ = 0, x ≈ 1,720 → 5,320
    // rpm; logged every 100, 5,300 rpm, where T = 146.88 lb·ft and the file says
    // 146.88 × 5300 / 5252 = 148.22 hp — above the rule's 145
    expect(measured!.powerRpm).toBe(5300);
    expect(measured!.powerHp).toBeCloseTo(Number(((146.88 * 5300) / 5252).toFixed(2)), 6);
    expect(measured!.torqueRpm).toBe(3600);
    expect(nmToLbFt(measured!.torqueNm)).toBeCloseTo(170, 6);

    const effect = await measuredEffect(db, packageId, measured);
    expect(effect!.specPowerHp).toBe(130);
    expect(effect!.changes).toEqual([
      {
        change: "applies",
        ruleName,
        kind: "upgrade",
        message: "Upgrade the rear-axle adjusters.",
      },
    ]);
    const withIt = await evaluateSpec(db, spec, false, undefined, undefined, measured);
    expect(withIt.snapshot.power_basis).toBe("measured");
    expect(withIt.snapshot.numbers.power_hp).toBe(Math.round(measured!.powerHp * 10) / 10);

    // the dyno page shows it to the service writer too; the apprentice gets 403
    const page = await settle(
      call(dynoLoader, await requestAs(writer, `/packages/${packageId}/dyno`), {
        id: String(packageId),
      }),
    );
    const body = (await page.json()) as any;
    expect(body.effect.changes[0].ruleName).toBe(ruleName);
    const refused = await settle(
      call(dynoLoader, await requestAs(apprentice, `/packages/${packageId}/dyno`), {
        id: String(packageId),
      }),
    );
    expect(refused.status).toBe(403);
  });
});

describe("build photos", () => {
  it("stores a re-encoded photo without EXIF, and a thumbnail", async () => {
    const jpeg = await sharp({
      create: { width: 1200, height: 800, channels: 3, background: "#446688" },
    })
      .jpeg()
      .withExif({ IFD0: { Copyright: `Camera owner ${tag}`, Software: "test camera" } })
      .toBuffer();
    expect((await sharp(jpeg).metadata()).exif).toBeInstanceOf(Buffer);
    const before = await stored(photoPackageId);
    const r = await postPhoto(
      photoPackageId,
      new Blob([jpeg], { type: "image/jpeg" }),
      "top-end.jpg",
    );
    expect(r.status).toBe(201);
    expect(await stored(photoPackageId)).toEqual({
      ...before,
      keys: before.keys + 2,
      files: before.files + 2,
      photos: before.photos + 1,
    });
    const photo = await db
      .selectFrom("package_photos")
      .selectAll()
      .where("id", "=", r.body.photoId)
      .executeTakeFirstOrThrow();
    expect([photo.width, photo.height]).toEqual([1200, 800]);
    const full = await settle(
      call(fileLoader, await requestAs(writer, `/files/${photo.file_id}`), {
        id: String(photo.file_id),
      }),
    );
    const fullMeta = await sharp(Buffer.from(await full.arrayBuffer())).metadata();
    expect(fullMeta.format).toBe("jpeg");
    expect(fullMeta.exif).toBeUndefined();
    const thumb = await settle(
      call(fileLoader, await requestAs(writer, `/files/${photo.thumb_file_id}`), {
        id: String(photo.thumb_file_id),
      }),
    );
    expect(thumb.headers.get("Content-Type")).toBe("image/webp");
    const tm = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
    expect([tm.format, tm.width, tm.height]).toEqual(["webp", 360, 240]);

    // on the sheet, then removed with both objects
    const on = await settle(
      call(
        photoChange,
        await requestAs(builder, `/packages/${photoPackageId}/photos/${photo.id}`, {
          method: "POST",
          body: new URLSearchParams({ intent: "on-sheet", onSheet: "true" }),
        }),
        { id: String(photoPackageId), photoId: String(photo.id) },
      ),
    );
    expect(on.status).toBe(200);
    expect(
      (
        await db
          .selectFrom("package_photos")
          .select("on_sheet")
          .where("id", "=", photo.id)
          .executeTakeFirstOrThrow()
      ).on_sheet,
    ).toBe(true);
    const gone = await settle(
      call(
        photoChange,
        await requestAs(builder, `/packages/${photoPackageId}/photos/${photo.id}`, {
          method: "POST",
          body: new URLSearchParams({ intent: "remove" }),
        }),
        { id: String(photoPackageId), photoId: String(photo.id) },
      ),
    );
    expect(gone.status).toBe(200);
    expect(await stored(photoPackageId)).toEqual(before);
  });

  const fakes: [string, () => Uint8Array<ArrayBuffer>, RegExp][] = [
    [
      "an executable renamed .jpg",
      () => {
        // an ELF header (the first bytes of a Linux program)
        const b = new Uint8Array(4096);
        b.set([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]);
        return b;
      },
      /^This file is a Linux program, whatever its name says\./,
    ],
    [
      "a PDF renamed .jpg",
      () => new TextEncoder().encode("%PDF-1.4\n1 0 obj\n<<>>\nendobj\ntrailer\n<<>>\n%%EOF\n"),
      /^This file is a PDF document, whatever its name says\./,
    ],
    [
      "text renamed .png",
      () => new TextEncoder().encode("not a picture at all"),
      /^This file is not an image, whatever its name says\./,
    ],
  ];
  for (const [what, bytes, message] of fakes) {
    it(`refuses ${what}, storing nothing`, async () => {
      const before = await stored(photoPackageId);
      const r = await postPhoto(
        photoPackageId,
        new Blob([bytes()], { type: "image/jpeg" }),
        "photo.jpg",
      );
      expect(r.status).toBe(415);
      expect(r.body.message).toMatch(message);
      expect(await stored(photoPackageId)).toEqual(before);
    });
  }

  it("refuses a photo over 15 MB", async () => {
    const before = await stored(photoPackageId);
    const r = await postPhoto(
      photoPackageId,
      new Blob([new Uint8Array(16 * 1024 * 1024)]),
      "big.jpg",
    );
    expect(r.status).toBe(413);
    expect(r.body.message).toBe("The photo is larger than 15 MB; nothing was stored.");
    expect(await stored(photoPackageId)).toEqual(before);
  });
});
