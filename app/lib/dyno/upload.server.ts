// Uploading a dyno run: the form checked, the file's bytes checked to be text, the CSV
// read row by row from the upload's stream, and — only when the run is good, or the user
// accepted dropping its bad rows — the file streamed to storage and the run with its
// points stored in one transaction. A refused or failed upload leaves no object and no row.
import Papa from "papaparse";
import type { SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import type { Db } from "../db.server";
import type { SessionUser } from "../auth/auth.server";
import { deleteObjects, newObjectKey, putObjectStream } from "../storage/storage.server";
import { headBytes, parseUpload, sniffType } from "../storage/upload.server";
import {
  MAX_RUN_BYTES,
  RunParser,
  correctionFor,
  type BadRow,
  type Correction,
  type RunWeather,
  type PowerUnit,
  type TorqueUnit,
} from "./run";
import { fToC, inHgToKPa } from "./weather";
import { RunFormSchema } from "./run-form";

export type RunUploadAnswer =
  | { ok: true; runId: number; points: number; dropped: number }
  | {
      ok: false;
      message: string;
      badRows?: BadRow[];
      badCount?: number;
      result?: SubmissionResult<string[]>;
    };

const answer = (body: RunUploadAnswer, status: number) => Response.json(body, { status });

export async function uploadRun(
  db: Db,
  user: SessionUser,
  packageId: number,
  request: Request,
): Promise<Response> {
  const pkg = await db
    .selectFrom("packages")
    .select("id")
    .where("id", "=", packageId)
    .executeTakeFirst();
  if (!pkg) {
    await request.body?.cancel().catch(() => {});
    return answer({ ok: false, message: "This package does not exist." }, 404);
  }
  const parsed = await parseUpload(request, "file", MAX_RUN_BYTES, "run file");
  if (!parsed.ok) return answer({ ok: false, message: parsed.message }, parsed.status);
  const submission = parseWithZod(parsed.form, { schema: RunFormSchema });
  if (submission.status !== "success")
    return answer(
      { ok: false, message: "Check the fields marked below.", result: submission.reply() },
      400,
    );
  const v = submission.value;
  const file = v.file;
  if (file.size === 0) return answer({ ok: false, message: "The file is empty." }, 400);

  const kind = await sniffType(file);
  if (kind)
    return answer(
      {
        ok: false,
        message: `This file is ${kind.ext.toUpperCase()} data (${kind.mime}), not a CSV text file; nothing was stored.`,
      },
      415,
    );
  if ((await headBytes(file)).includes(0))
    return answer(
      { ok: false, message: "This file holds binary data, not CSV text; nothing was stored." },
      415,
    );

  const run = new RunParser({
    torque: v.torqueUnit as TorqueUnit,
    power: v.powerUnit as PowerUnit,
  });
  try {
    await readCsv(file, run);
  } catch {
    return answer(
      {
        ok: false,
        message: "The file is not UTF-8 text (a CSV saved as text); nothing was stored.",
      },
      415,
    );
  }
  const refusal = run.refusal(v.dropBad === "on");
  if (refusal)
    return answer(
      { ok: false, message: refusal, badRows: run.badRows, badCount: run.badCount },
      422,
    );

  const weather = {
    airTempC: v.airTemp === undefined ? null : v.tempUnit === "F" ? fToC(v.airTemp) : v.airTemp,
    baroKPa: v.baro === undefined ? null : v.baroUnit === "inhg" ? inHgToKPa(v.baro) : v.baro,
    humidityPct: v.humidity ?? null,
  };
  let correction: ReturnType<typeof correctionFor>;
  try {
    correction = correctionFor(weather);
  } catch (e) {
    return answer(
      { ok: false, message: `The weather cannot be used: ${(e as Error).message}.` },
      400,
    );
  }
  const runId = await storeRun(db, {
    packageId,
    userId: user.id,
    file,
    details: v,
    weather,
    correction,
    run,
  });
  return answer({ ok: true, runId, points: run.points.length, dropped: run.badCount }, 201);
}

export interface StoreRunInput {
  packageId: number;
  userId: number | null;
  file: Blob & { name?: string };
  details: {
    label: string;
    runDate?: string;
    gear: string;
    notes: string;
    torqueUnit: TorqueUnit;
    powerUnit: PowerUnit;
  };
  weather: RunWeather;
  correction: Correction;
  run: RunParser;
}

/**
 * Streams an accepted run file to storage, then stores the run and its points in one
 * transaction; if anything fails after the object went in, the object is deleted.
 */
export async function storeRun(db: Db, input: StoreRunInput): Promise<number> {
  const { packageId, file, correction, run, weather } = input;
  const v = input.details;
  const user = { id: input.userId };
  const factor = correction.ok ? correction.factor : null;

  const key = newObjectKey(packageId, "dyno", "csv");
  let stored: Awaited<ReturnType<typeof putObjectStream>> | null = null;
  try {
    stored = await putObjectStream(key, file.stream(), file.size, "text/csv");
    const runId = await db.transaction().execute(async (trx) => {
      const f = await trx
        .insertInto("stored_files")
        .values({
          package_id: packageId,
          object_key: key,
          kind: "dyno_run",
          content_type: "text/csv",
          byte_size: stored!.byteSize,
          sha256: stored!.sha256,
          original_name: safeName(file.name ?? "run.csv"),
          uploaded_by: user.id,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      const r = await trx
        .insertInto("dyno_runs")
        .values({
          package_id: packageId,
          file_id: f.id,
          label: v.label,
          run_date: v.runDate ?? null,
          gear: v.gear,
          notes: v.notes,
          torque_unit: v.torqueUnit,
          power_unit: v.powerUnit,
          air_temp_c: weather.airTempC === null ? null : round(weather.airTempC, 2),
          baro_kpa: weather.baroKPa === null ? null : round(weather.baroKPa, 3),
          humidity_pct: weather.humidityPct,
          correction_factor: factor,
          correction_standard: correction.ok ? correction.standard : null,
          point_count: run.points.length,
          dropped_rows: run.badCount,
          created_by: user.id,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      for (let i = 0; i < run.points.length; i += 2000) {
        await trx
          .insertInto("dyno_points")
          .values(
            run.points.slice(i, i + 2000).map((p, j) => ({
              run_id: r.id,
              seq: i + j,
              line: p.line,
              rpm: p.rpm,
              torque_nm: p.torqueNm,
              power_kw: p.powerKw,
              torque_nm_corrected: factor === null ? null : p.torqueNm * factor,
              power_kw_corrected: factor === null ? null : p.powerKw * factor,
            })),
          )
          .execute();
      }
      return r.id;
    });
    return runId;
  } catch (e) {
    // whatever failed after the object went in, the object goes too
    await deleteObjects([key]).catch(() => {});
    throw e;
  }
}

/** Streams the file through a strict UTF-8 decoder into papaparse, row by row. */
async function readCsv(file: Blob, run: RunParser): Promise<void> {
  const decoder = new TextDecoder("utf-8", { fatal: true });
  let line = 0;
  let first = true;
  let rest = "";
  let delimiter: string | undefined;
  const feed = (textChunk: string, last: boolean) => {
    // whole lines only; a quoted field spanning lines is not part of a run file
    const all = rest + textChunk;
    const cut = last ? all.length : all.lastIndexOf("\n") + 1;
    rest = all.slice(cut);
    const whole = all.slice(0, cut);
    if (whole === "") return;
    // the separator is guessed once, from the first lines, and kept for the rest
    const out = Papa.parse<string[]>(whole, { skipEmptyLines: false, delimiter });
    delimiter ??= out.meta.delimiter;
    const rows = out.data;
    const lines = whole.split("\n").length - (whole.endsWith("\n") ? 1 : 0);
    for (let i = 0; i < rows.length && !run.tooMany; i++) run.row(rows[i]!, line + i + 1);
    line += lines;
  };
  const reader = file.stream().getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    let t = decoder.decode(value, { stream: true });
    if (first) {
      t = t.replace(/^\uFEFF/, "");
      first = false;
    }
    feed(t, false);
    if (run.tooMany || run.columnsError) {
      await reader.cancel();
      return;
    }
  }
  feed(decoder.decode(), true);
}

function safeName(name: string): string {
  // eslint-disable-next-line no-control-regex -- control characters are what is refused
  return name.replace(/[\u0000-\u001f\u007f]/g, "").slice(0, 200) || "run.csv";
}

function round(n: number, places: number): number {
  const f = 10 ** places;
  return Math.round(n * f) / f;
}
