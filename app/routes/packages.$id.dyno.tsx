import { readForm } from "~/lib/http/body";
import { useMemo, useState } from "react";
import { data, Link, useFetcher } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.$id.dyno";
import { requireRole } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { getDb } from "~/lib/db.server";
import { requireIdParam, parseId } from "~/lib/http/ids";
import { getPackageHeader } from "~/lib/packages/store.server";
import { getUnits, setUnits } from "~/lib/units-pref.server";
import { deleteRun, listRuns, setRunCounts } from "~/lib/dyno/runs.server";
import { readMeasured } from "~/lib/dyno/measured.server";
import { measuredEffect } from "~/lib/dyno/findings.server";
import { displayUnits, powerBand } from "~/lib/dyno/run";
import { SAE_J1349_REFERENCE, SAE_J1349_REVISION } from "../../calc";
import { DynoChart } from "~/components/dyno/dyno-chart";
import { RunUploadForm } from "~/components/dyno/run-upload-form";
import { RunList } from "~/components/dyno/run-list";
import { MeasuredPanel } from "~/components/dyno/measured-panel";
import { buildSeries, seriesCsv } from "~/components/dyno/series";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, "owner", "builder", "service_writer");
  const db = getDb();
  const id = requireIdParam(params);
  const header = await getPackageHeader(db, id);
  if (!header) throw data("No package with this number.", { status: 404 });
  const [runs, units, measured] = await Promise.all([
    listRuns(db, id),
    getUnits(db, user.id),
    readMeasured(db, id),
  ]);
  const effect = await measuredEffect(db, id, measured);
  return { header, runs, units, measured, effect, canLog: can(user.role, "dyno:log") };
}

const Intent = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("counts"), runId: z.string(), counts: z.enum(["true", "false"]) }),
  z.object({ intent: z.literal("delete-run"), runId: z.string() }),
  z.object({ intent: z.literal("set-units"), units: z.enum(["inch", "metric"]) }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const form = await readForm(request);
  const user = await requireRole(request, "owner", "builder", "service_writer");
  const packageId = requireIdParam(params);
  const parsed = Intent.safeParse(Object.fromEntries(form));
  if (!parsed.success) return data({ ok: false, message: "Unknown change." }, { status: 400 });
  const db = getDb();
  const a = parsed.data;
  if (a.intent === "set-units") {
    await setUnits(db, user.id, a.units);
    return data({ ok: true, message: "" });
  }
  if (!can(user.role, "dyno:log")) throw data("Only a builder logs dyno runs.", { status: 403 });
  const runId = parseId(a.runId);
  if (runId === null) throw data("No such run.", { status: 404 });
  if (a.intent === "delete-run") {
    if (!(await deleteRun(db, packageId, runId))) throw data("No such run.", { status: 404 });
    return data({ ok: true, message: "" });
  }
  const out = await setRunCounts(db, packageId, runId, a.counts === "true");
  if (!out) throw data("No such run.", { status: 404 });
  return out.ok
    ? data({ ok: true, message: "" })
    : data({ ok: false, message: out.message }, { status: 400 });
}

export default function DynoPage({ loaderData }: Route.ComponentProps) {
  const { header, runs, units, measured, effect, canLog } = loaderData;
  const u = displayUnits(units);
  const unitsFetcher = useFetcher();
  const [hidden, setHidden] = useState<Set<number>>(new Set());
  const [showObserved, setShowObserved] = useState(false);
  const shown = runs.filter((r) => !hidden.has(r.id));
  const series = useMemo(
    () => buildSeries(shown, units, showObserved),
    [shown, units, showObserved],
  );
  const rpmMin = Math.min(...runs.flatMap((r) => r.observed.map((p) => p.rpm)));
  const rpmMax = Math.max(...runs.flatMap((r) => r.observed.map((p) => p.rpm)));
  const [band, setBand] = useState<{ from: string; to: string }>({ from: "", to: "" });
  const from = Number(band.from || (runs.length ? Math.ceil(rpmMin / 100) * 100 + 500 : 0));
  const to = Number(band.to || (runs.length ? Math.floor(rpmMax / 100) * 100 - 500 : 0));
  const bandOk = to > from;
  const [tableRun, setTableRun] = useState<string>("");
  const tableSeries = series.find((s) => s.key === tableRun) ?? series[0];
  const csv = seriesCsv(series, units);

  return (
    <main className="mx-auto max-w-7xl space-y-6 p-4">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <div>
          <p className="text-sm">
            <Link to={`/packages/${header.id}`} className="text-teal-text underline">
              {header.name}
            </Link>
          </p>
          <h1 className="text-2xl font-semibold text-ink">Dyno log</h1>
        </div>
        <unitsFetcher.Form method="post" className="flex items-center gap-2 text-sm">
          <input type="hidden" name="intent" value="set-units" />
          <span>Units:</span>
          <button
            name="units"
            value={units === "inch" ? "metric" : "inch"}
            className="rounded border border-steel-300 bg-white px-2 py-1"
          >
            {units === "inch" ? "lb·ft, hp — switch to N·m, kW" : "N·m, kW — switch to lb·ft, hp"}
          </button>
        </unitsFetcher.Form>
      </header>

      <p className="rounded border border-amber bg-white p-3 text-sm text-graphite">
        Dyno figures depend on the dyno, its operator and the day. Corrected figures follow{" "}
        {SAE_J1349_REVISION} (reference {SAE_J1349_REFERENCE.airTempC} °C,{" "}
        {SAE_J1349_REFERENCE.dryAirPressureKPa} kPa dry air). Chassis parts chosen from these
        figures are checked by a qualified technician against the parts maker&apos;s limits.
      </p>

      <MeasuredPanel measured={measured} effect={effect} units={units} />

      {runs.length > 0 ? (
        <section aria-labelledby="chart-h" className="space-y-3">
          <h2 id="chart-h" className="text-lg font-semibold">
            Curves
          </h2>
          <div className="flex flex-wrap items-center gap-4 text-sm">
            {runs.map((r) => (
              <label key={r.id} className="flex items-center gap-1">
                <input
                  type="checkbox"
                  checked={!hidden.has(r.id)}
                  onChange={(e) => {
                    const next = new Set(hidden);
                    if (e.target.checked) next.delete(r.id);
                    else next.add(r.id);
                    setHidden(next);
                  }}
                />
                Show {r.label}
              </label>
            ))}
            <label className="flex items-center gap-1">
              <input
                type="checkbox"
                checked={showObserved}
                onChange={(e) => setShowObserved(e.target.checked)}
              />
              Observed curves too
            </label>
          </div>
          <div className="grid gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
            <div className="min-w-0 rounded border border-steel-200 bg-white p-2">
              {series.length > 0 ? (
                <DynoChart
                  series={series}
                  torqueUnit={u.torque}
                  powerUnit={u.power}
                  band={bandOk ? { from, to } : null}
                />
              ) : (
                <p className="p-4 text-sm">Tick a run to draw it.</p>
              )}
            </div>
            <div className="min-w-0 space-y-2">
              <label className="block text-sm font-semibold" htmlFor="table-run">
                Table of
              </label>
              <select
                id="table-run"
                className="block w-full rounded border border-steel-300 bg-white px-2 py-1"
                value={tableSeries?.key ?? ""}
                onChange={(e) => setTableRun(e.target.value)}
              >
                {series.map((s) => (
                  <option key={s.key} value={s.key}>
                    {s.name}
                  </option>
                ))}
              </select>
              {tableSeries ? (
                <div className="max-h-[340px] overflow-auto rounded border border-steel-200 bg-white">
                  <table className="w-full text-sm tabular-nums">
                    <caption className="sr-only">{tableSeries.name}</caption>
                    <thead className="sticky top-0 bg-steel-100">
                      <tr>
                        <th scope="col" className="px-2 py-1 text-right">
                          rpm
                        </th>
                        <th scope="col" className="px-2 py-1 text-right">
                          Torque ({u.torque})
                        </th>
                        <th scope="col" className="px-2 py-1 text-right">
                          Power ({u.power})
                        </th>
                      </tr>
                    </thead>
                    <tbody>
                      {tableSeries.points.map((p) => (
                        <tr key={p.rpm} className="border-t border-steel-100">
                          <td className="px-2 text-right">{p.rpm}</td>
                          <td className="px-2 text-right">{p.torque.toFixed(1)}</td>
                          <td className="px-2 text-right">{p.power.toFixed(1)}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              ) : null}
              <a
                className="inline-block text-sm text-teal-text underline"
                download={`dyno-${header.id}.csv`}
                href={`data:text/csv;charset=utf-8,${encodeURIComponent(csv)}`}
              >
                The chart&apos;s data as CSV
              </a>
            </div>
          </div>

          <section
            aria-labelledby="peaks-h"
            className="rounded border border-steel-200 bg-white p-3"
          >
            <h3 id="peaks-h" className="font-semibold">
              Peaks and usable power
            </h3>
            <div className="mt-2 flex flex-wrap items-end gap-3 text-sm">
              <label>
                From (rpm)
                <input
                  className="ml-1 w-24 rounded border border-steel-300 px-2 py-1"
                  inputMode="numeric"
                  value={band.from || String(from)}
                  onChange={(e) => setBand({ ...band, from: e.target.value })}
                />
              </label>
              <label>
                to (rpm)
                <input
                  className="ml-1 w-24 rounded border border-steel-300 px-2 py-1"
                  inputMode="numeric"
                  value={band.to || String(to)}
                  onChange={(e) => setBand({ ...band, to: e.target.value })}
                />
              </label>
              {!bandOk ? (
                <span className="text-red-text">The band needs “to” above “from”.</span>
              ) : null}
            </div>
            <div className="mt-2 overflow-x-auto">
              <table className="w-full text-sm tabular-nums" data-testid="peaks">
                <thead>
                  <tr className="text-left">
                    <th scope="col" className="py-1 pr-3">
                      Curve
                    </th>
                    <th scope="col" className="pr-3">
                      Peak power
                    </th>
                    <th scope="col" className="pr-3">
                      Peak torque
                    </th>
                    <th scope="col" className="pr-3">
                      Average power {bandOk ? `${from}–${to} rpm` : ""}
                    </th>
                    <th scope="col">Area under power</th>
                  </tr>
                </thead>
                <tbody>
                  {series.map((s) => {
                    const run = runs.find((r) => r.id === s.runId)!;
                    const pts =
                      s.basis === "observed" ? run.observed : (run.corrected ?? run.observed);
                    const b = bandOk ? powerBand(pts, from, to) : null;
                    return (
                      <tr key={s.key} className="border-t border-steel-100">
                        <th scope="row" className="py-1 pr-3 text-left font-normal">
                          <span
                            aria-hidden
                            className="mr-1 inline-block h-2 w-4"
                            style={{ background: s.color }}
                          />
                          {s.name}
                        </th>
                        <td className="pr-3">
                          {s.peakPower
                            ? `${s.peakPower.value.toFixed(1)} ${u.power} at ${s.peakPower.rpm} rpm`
                            : "—"}
                        </td>
                        <td className="pr-3">
                          {s.peakTorque
                            ? `${s.peakTorque.value.toFixed(1)} ${u.torque} at ${s.peakTorque.rpm} rpm`
                            : "—"}
                        </td>
                        <td className="pr-3">
                          {b
                            ? `${u.powerOf(b.averageKw).toFixed(1)} ${u.power}`
                            : "run does not cover the band"}
                        </td>
                        <td>
                          {b
                            ? `${Math.round(u.powerOf(b.areaKwRpm)).toLocaleString("en-US")} ${u.power}·rpm`
                            : "—"}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </section>
        </section>
      ) : (
        <p className="text-sm">No runs yet.{canLog ? " Upload the first one below." : ""}</p>
      )}

      <RunList runs={runs} units={units} canLog={canLog} />

      {canLog ? (
        <section
          aria-labelledby="upload-h"
          className="rounded border border-steel-200 bg-white p-4"
        >
          <h2 id="upload-h" className="mb-2 text-lg font-semibold">
            Upload a run
          </h2>
          <RunUploadForm packageId={header.id} units={units} />
        </section>
      ) : null}
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: d ? `Dyno log · ${d.header.name} · Torquewright` : "Dyno log · Torquewright" }];
}
