import { data, Link } from "react-router";
import type { Route } from "./+types/packages.$id.sheet";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { listPhotos } from "~/lib/photos/photos.server";
import { loadSheet } from "~/lib/sheet/load.server";

// The spec sheet: one printable page for the technician (print styles hide the rest).
export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "packages:read");
  const id = requireIdParam(params);
  const [sheet, photos] = await Promise.all([loadSheet(getDb(), id), listPhotos(getDb(), id)]);
  if (!sheet) throw data("No package with this number.", { status: 404 });
  // the build photos the builder chose for the sheet
  return { id, sheet, photos: photos.filter((p) => p.onSheet) };
}

export default function SpecSheet({ loaderData }: Route.ComponentProps) {
  const { id, sheet, photos } = loaderData;
  return (
    <main className="sheet mx-auto max-w-4xl bg-white px-6 py-6 text-graphite print:max-w-none print:p-0">
      <p className="flex flex-wrap gap-4 text-sm print:hidden">
        <Link to={`/packages/${id}`} className="text-teal-text underline">
          ← Back to the package
        </Link>
        <button type="button" onClick={() => window.print()} className="text-teal-text underline">
          Print
        </button>
        <a href={`/packages/${id}/sheet.pdf`} className="text-teal-text underline" download>
          Download PDF
        </a>
      </p>
      <h1 className="mt-2 text-2xl font-semibold text-ink">Spec sheet: {sheet.title}</h1>
      <p className="text-sm text-steel-700">{sheet.subtitle}</p>
      <h2 className="mt-4 text-lg font-semibold text-ink">The numbers</h2>
      <table className="mt-1 w-full text-sm tabular-nums">
        <thead>
          <tr className="border-b border-steel-300 text-left">
            <th scope="col" className="py-1 font-semibold">
              Figure
            </th>
            <th scope="col" className="py-1 text-right font-semibold">
              Inch
            </th>
            <th scope="col" className="py-1 text-right font-semibold">
              Metric
            </th>
          </tr>
        </thead>
        <tbody>
          {sheet.figures.map((f) => (
            <tr key={f.label} className="border-b border-steel-200">
              <th scope="row" className="py-1 text-left font-normal">
                {f.label}
              </th>
              <td className="py-1 text-right">{f.inch}</td>
              <td className="py-1 text-right">{f.metric}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <h2 className="mt-4 text-lg font-semibold text-ink">Parts by slot</h2>
      <dl className="mt-1 grid grid-cols-1 gap-x-6 text-sm sm:grid-cols-2 print:grid-cols-2">
        {sheet.slots.map((s) => (
          <div key={s.label} className="break-inside-avoid border-b border-steel-200 py-1">
            <dt className="font-semibold text-ink">{s.label}</dt>
            <dd>{s.part ?? "No part; measured values only"}</dd>
            {s.values.map((v) => (
              <dd key={v.label} className="text-steel-700">
                {v.label}: {v.value}{" "}
                <span className={v.measured ? "font-semibold text-ink" : ""}>
                  {v.measured ? "(measured)" : "(catalog)"}
                </span>
              </dd>
            ))}
          </div>
        ))}
      </dl>
      {sheet.findings.length || sheet.cautions.length ? (
        <>
          <h2 className="mt-4 text-lg font-semibold text-ink">Findings and cautions</h2>
          <ul className="mt-1 list-disc pl-5 text-sm">
            {sheet.findings.map((f, i) => (
              <li key={`f${i}`}>
                <strong>{f.kind}:</strong> {f.message}
              </li>
            ))}
            {sheet.cautions.map((c, i) => (
              <li key={`c${i}`}>{c}</li>
            ))}
          </ul>
        </>
      ) : null}
      {photos.length ? (
        <>
          <h2 className="mt-4 text-lg font-semibold text-ink">Build photos</h2>
          <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-4 print:grid-cols-4">
            {photos.map((p) => (
              <figure key={p.id} className="break-inside-avoid">
                <img
                  src={`/files/${p.thumbFileId}`}
                  alt={p.caption || "Build photo"}
                  className="w-full rounded border border-steel-200"
                />
                {p.caption ? <figcaption className="text-xs">{p.caption}</figcaption> : null}
              </figure>
            ))}
          </div>
        </>
      ) : null}
      <aside className="mt-4 break-inside-avoid rounded border-2 border-amber px-3 py-2 text-sm">
        <p className="font-semibold text-ink">Safety</p>
        <ul className="list-disc pl-5">
          {sheet.safety.map((l) => (
            <li key={l}>{l}</li>
          ))}
        </ul>
      </aside>
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `Spec sheet · ${d?.sheet.title ?? "Package"} · Torquewright` }];
}
