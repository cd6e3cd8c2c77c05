// A package's dyno runs as the dyno page shows them, and the builder's changes to them.
import { sql } from "kysely";
import type { Db } from "../db.server";
import { deleteObjects } from "../storage/storage.server";
import type { CurvePoint } from "./run";

export interface RunView {
  id: number;
  label: string;
  runDate: string | null;
  gear: string;
  notes: string;
  torqueUnit: "lbft" | "nm";
  powerUnit: "hp" | "kw";
  airTempC: number | null;
  baroKPa: number | null;
  humidityPct: number | null;
  correctionFactor: number | null;
  correctionStandard: string | null;
  counts: boolean;
  droppedRows: number;
  fileId: number;
  fileName: string;
  sha256: string;
  byteSize: number;
  createdAt: string;
  observed: CurvePoint[];
  /** null when the weather is missing */
  corrected: CurvePoint[] | null;
}

export async function listRuns(db: Db, packageId: number): Promise<RunView[]> {
  const runs = await db
    .selectFrom("dyno_runs as r")
    .innerJoin("stored_files as f", "f.id", "r.file_id")
    .select([
      "r.id",
      "r.label",
      sql<string | null>`to_char(r.run_date, 'YYYY-MM-DD')`.as("run_date"),
      "r.gear",
      "r.notes",
      "r.torque_unit",
      "r.power_unit",
      "r.air_temp_c",
      "r.baro_kpa",
      "r.humidity_pct",
      "r.correction_factor",
      "r.correction_standard",
      "r.counts",
      "r.dropped_rows",
      "r.created_at",
      "f.id as file_id",
      "f.original_name",
      "f.sha256",
      "f.byte_size",
    ])
    .where("r.package_id", "=", packageId)
    .orderBy("r.id")
    .execute();
  if (runs.length === 0) return [];
  const points = await db
    .selectFrom("dyno_points")
    .select(["run_id", "rpm", "torque_nm", "power_kw", "torque_nm_corrected", "power_kw_corrected"])
    .where(
      "run_id",
      "in",
      runs.map((r) => r.id),
    )
    .orderBy("run_id")
    .orderBy("seq")
    .execute();
  const byRun = new Map<number, typeof points>();
  for (const p of points) {
    const list = byRun.get(p.run_id) ?? [];
    list.push(p);
    byRun.set(p.run_id, list);
  }
  return runs.map((r) => {
    const pts = byRun.get(r.id) ?? [];
    return {
      id: r.id,
      label: r.label,
      runDate: r.run_date,
      gear: r.gear,
      notes: r.notes,
      torqueUnit: r.torque_unit,
      powerUnit: r.power_unit,
      airTempC: r.air_temp_c,
      baroKPa: r.baro_kpa,
      humidityPct: r.humidity_pct,
      correctionFactor: r.correction_factor,
      correctionStandard: r.correction_standard,
      counts: r.counts,
      droppedRows: r.dropped_rows,
      fileId: r.file_id,
      fileName: r.original_name,
      sha256: r.sha256,
      byteSize: r.byte_size,
      createdAt: new Date(r.created_at).toISOString(),
      observed: pts.map((p) => ({ rpm: p.rpm, torqueNm: p.torque_nm, powerKw: p.power_kw })),
      corrected:
        r.correction_factor === null
          ? null
          : pts.map((p) => ({
              rpm: p.rpm,
              torqueNm: p.torque_nm_corrected ?? p.torque_nm,
              powerKw: p.power_kw_corrected ?? p.power_kw,
            })),
    };
  });
}

export type RunChange = { ok: true } | { ok: false; message: string };

/** Marks a run as counting (or not) for the package's measured figure. */
export async function setRunCounts(
  db: Db,
  packageId: number,
  runId: number,
  counts: boolean,
): Promise<RunChange | null> {
  const run = await db
    .selectFrom("dyno_runs")
    .select(["id", "correction_factor"])
    .where("id", "=", runId)
    .where("package_id", "=", packageId)
    .executeTakeFirst();
  if (!run) return null;
  if (counts && run.correction_factor === null)
    return {
      ok: false,
      message:
        "A run without its weather cannot count: only figures corrected to standard conditions compare.",
    };
  await db.updateTable("dyno_runs").set({ counts }).where("id", "=", runId).execute();
  return { ok: true };
}

/** Removes a run, its points, its row of the stored file and the object itself. */
export async function deleteRun(db: Db, packageId: number, runId: number): Promise<boolean> {
  const key = await db.transaction().execute(async (trx) => {
    const run = await trx
      .deleteFrom("dyno_runs")
      .where("id", "=", runId)
      .where("package_id", "=", packageId)
      .returning("file_id")
      .executeTakeFirst();
    if (!run) return null;
    const f = await trx
      .deleteFrom("stored_files")
      .where("id", "=", run.file_id)
      .returning("object_key")
      .executeTakeFirstOrThrow();
    return f.object_key;
  });
  if (key === null) return false;
  await deleteObjects([key]);
  return true;
}
