// Demo dyno runs and build photos, stored the way uploads are (object storage + rows).
// Two runs on one package, before and after a cam change, with the day's weather; the
// after-cam run counts, so its measured power (above 145 hp) brings in the axle rule.
// Photos on another package are drawn here with sharp (no image files ship with the demo).
import type { Kysely } from "kysely";
import sharp from "sharp";
import type { Database } from "../schema";
import { RunParser, correctionFor } from "../../app/lib/dyno/run";
import { storeRun } from "../../app/lib/dyno/upload.server";
import { fToC, inHgToKPa } from "../../app/lib/dyno/weather";
import { storePhoto } from "../../app/lib/photos/photos.server";
import { listKeys } from "../../app/lib/storage/storage.server";

const DYNO_PACKAGE = "Mountain torque, 113 ci";
const PHOTO_PACKAGE = "Drag nights, 135 ci with tall bars";

/** An invented sweep: torque (lb·ft) a parabola in rpm with a little ripple; hp = T·rpm/5252. */
export function demoSweep(peakLbFt: number, peakRpm: number, fall: number, toRpm: number) {
  const lines = ["rpm,torque (lb-ft),power (hp)"];
  for (let rpm = 2500; rpm <= toRpm; rpm += 50) {
    const t = peakLbFt - fall * ((rpm - peakRpm) / 1000) ** 2 + 0.6 * Math.sin(rpm / 170);
    lines.push(`${rpm},${t.toFixed(2)},${((t * rpm) / 5252).toFixed(2)}`);
  }
  return lines.join("\n") + "\n";
}

const RUNS = [
  {
    label: "Before cam",
    runDate: "2026-11-18",
    csv: demoSweep(126, 3600, 4.2, 5900),
    weather: { f: 82, inHg: 29.72, rh: 45 },
    notes: "Baseline on the stock cam, fourth gear pull.",
    counts: false,
  },
  {
    label: "After cam",
    runDate: "2026-11-25",
    csv: demoSweep(150, 4000, 4, 6200),
    weather: { f: 88, inHg: 29.65, rh: 38 },
    notes: "Bolt-in cam swapped, fuel map adjusted. Same dyno, same gear.",
    counts: true,
  },
];

function demoPhotoSvg(title: string, hue: string) {
  const fins = Array.from(
    { length: 9 },
    (_, i) =>
      `<rect x="${330 + i * 6}" y="${180 + i * 34}" width="${540 - i * 12}" height="18" rx="6" fill="#c5ced8" stroke="#6b7886"/>`,
  ).join("");
  return Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="800">
    <rect width="1200" height="800" fill="${hue}"/>
    <rect x="300" y="150" width="600" height="340" rx="24" fill="#9aa7b4"/>${fins}
    <rect x="380" y="500" width="440" height="200" rx="16" fill="#46525e"/>
    <circle cx="600" cy="600" r="70" fill="#1f2933" stroke="#c5ced8" stroke-width="8"/>
    <text x="60" y="90" font-family="sans-serif" font-size="48" fill="#f4f6f8">${title}</text>
  </svg>`);
}

const PHOTOS = [
  { title: "Top end assembled (demo drawing)", hue: "#0d1b2a", caption: "Top end assembled" },
  { title: "Heads on the bench (demo drawing)", hue: "#1f2933", caption: "Heads, ported" },
  { title: "Tall bars fitted (demo drawing)", hue: "#0b6e70", caption: "Bars and lines" },
];

export async function seedDyno(db: Kysely<Database>) {
  try {
    await listKeys("packages/");
  } catch {
    console.log("db: object storage not reachable; demo dyno runs and photos skipped");
    return;
  }
  const builder = await db
    .selectFrom("users")
    .select("id")
    .where("role", "=", "builder")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  const pkgId = async (name: string) =>
    (
      await db
        .selectFrom("packages")
        .select("id")
        .where("name", "=", name)
        .executeTakeFirstOrThrow()
    ).id;

  const dynoPkg = await pkgId(DYNO_PACKAGE);
  for (const r of RUNS) {
    const run = new RunParser({ torque: "lbft", power: "hp" });
    r.csv.split("\n").forEach((line, i) => run.row(line.split(","), i + 1));
    if (run.refusal(false)) throw new Error(`seed: demo run ${r.label}: ${run.refusal(false)}`);
    const weather = {
      airTempC: fToC(r.weather.f),
      baroKPa: inHgToKPa(r.weather.inHg),
      humidityPct: r.weather.rh,
    };
    const file = Object.assign(new Blob([r.csv], { type: "text/csv" }), {
      name: `${r.label.toLowerCase().replace(/\W+/g, "-")}.csv`,
    });
    const id = await storeRun(db, {
      packageId: dynoPkg,
      userId: builder.id,
      file,
      details: {
        label: r.label,
        runDate: r.runDate,
        gear: "4",
        notes: r.notes,
        torqueUnit: "lbft",
        powerUnit: "hp",
      },
      weather,
      correction: correctionFor(weather),
      run,
    });
    if (r.counts)
      await db.updateTable("dyno_runs").set({ counts: true }).where("id", "=", id).execute();
  }

  const photoPkg = await pkgId(PHOTO_PACKAGE);
  for (const [i, p] of PHOTOS.entries()) {
    const png = await sharp(demoPhotoSvg(p.title, p.hue)).png().toBuffer();
    const id = await storePhoto(db, {
      packageId: photoPkg,
      userId: builder.id,
      input: png,
      name: `demo-photo-${i + 1}.png`,
      caption: p.caption,
    });
    if (id === null) throw new Error("seed: a demo photo could not be made");
    if (i === 0)
      await db.updateTable("package_photos").set({ on_sheet: true }).where("id", "=", id).execute();
  }
}
