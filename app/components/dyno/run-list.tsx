// The runs of a package: weather, correction factor, whether the run counts for the
// measured figure, its file, and (for the builder) mark or remove.
import { useFetcher } from "react-router";
import type { RunView } from "~/lib/dyno/runs.server";
import { cToF, kPaToInHg } from "~/lib/dyno/weather";

export function RunList({
  runs,
  units,
  canLog,
}: {
  runs: RunView[];
  units: "inch" | "metric";
  canLog: boolean;
}) {
  if (runs.length === 0) return null;
  return (
    <section aria-labelledby="runs-h" className="space-y-2">
      <h2 id="runs-h" className="text-lg font-semibold">
        Runs
      </h2>
      <ul className="grid gap-3 md:grid-cols-2">
        {runs.map((r) => (
          <RunCard key={r.id} run={r} units={units} canLog={canLog} />
        ))}
      </ul>
    </section>
  );
}

function RunCard({ run: r, units, canLog }: { run: RunView; units: string; canLog: boolean }) {
  const counts = useFetcher<{ ok: boolean; message: string }>();
  const remove = useFetcher();
  const weather =
    r.airTempC !== null && r.baroKPa !== null && r.humidityPct !== null
      ? units === "inch"
        ? `${cToF(r.airTempC).toFixed(0)} °F, ${kPaToInHg(r.baroKPa).toFixed(2)} inHg, ${r.humidityPct} % humidity`
        : `${r.airTempC.toFixed(1)} °C, ${r.baroKPa.toFixed(1)} kPa, ${r.humidityPct} % humidity`
      : null;
  const pending = counts.formData ? counts.formData.get("counts") === "true" : r.counts;
  return (
    <li
      className="rounded border border-steel-200 bg-white p-3 text-sm"
      data-testid={`run-${r.id}`}
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="text-base font-semibold">{r.label}</h3>
        <span className="text-steel-700">
          {[r.runDate, r.gear ? `gear ${r.gear}` : null].filter(Boolean).join(" · ")}
        </span>
      </div>
      {r.correctionFactor !== null ? (
        <p>
          Corrected to {r.correctionStandard}: factor{" "}
          <strong className="tabular-nums">{r.correctionFactor.toFixed(4)}</strong> ({weather})
        </p>
      ) : (
        <p className="font-semibold text-amber-text">
          Uncorrected: the weather for this run is missing, so its figures are as observed and it
          cannot count.
        </p>
      )}
      {r.notes ? <p className="text-steel-700">{r.notes}</p> : null}
      <p className="text-steel-700">
        {r.observed.length} points
        {r.droppedRows ? `, ${r.droppedRows} bad rows dropped on upload` : ""} ·{" "}
        <a className="text-teal-text underline" href={`/files/${r.fileId}`}>
          {r.fileName}
        </a>{" "}
        · SHA-256 <code className="break-all text-xs">{r.sha256.slice(0, 16)}…</code>
      </p>
      {canLog ? (
        <div className="mt-2 flex flex-wrap items-center gap-3">
          <counts.Form method="post">
            <input type="hidden" name="intent" value="counts" />
            <input type="hidden" name="runId" value={r.id} />
            <input type="hidden" name="counts" value={pending ? "false" : "true"} />
            <button
              type="submit"
              aria-pressed={pending}
              disabled={r.correctionFactor === null}
              className="rounded border border-teal-dark bg-white px-2 py-1 font-semibold text-teal-text disabled:opacity-60"
            >
              {pending ? "Counts for the measured figure ✓" : "Count this run"}
            </button>
          </counts.Form>
          <remove.Form
            method="post"
            onSubmit={(e) => {
              if (!confirm(`Remove the run “${r.label}” and its file?`)) e.preventDefault();
            }}
          >
            <input type="hidden" name="intent" value="delete-run" />
            <input type="hidden" name="runId" value={r.id} />
            <button type="submit" className="text-red-text underline">
              Remove run
            </button>
          </remove.Form>
          {counts.data && !counts.data.ok ? (
            <p role="alert" className="text-red-text">
              {counts.data.message}
            </p>
          ) : null}
        </div>
      ) : r.counts ? (
        <p className="mt-1 font-semibold">Counts for the measured figure</p>
      ) : null}
    </li>
  );
}
