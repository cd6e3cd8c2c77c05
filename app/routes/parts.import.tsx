import { readForm } from "~/lib/http/body";
import { hasControlChars } from "~/lib/http/text";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/parts.import";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { CSV_COLUMNS, MAX_CSV_BYTES } from "~/components/catalog/csv-columns";
import { checkPartsCsv, importPartsCsv, type CsvCheck } from "~/lib/catalog/csv.server";
import { getDb } from "~/lib/db.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "parts:edit");
  return null;
}

type ImportData = {
  message: string | null;
  check: CsvCheck | null;
  csv: string | null;
  written: number | null;
};
const TOO_BIG = `The file is larger than ${MAX_CSV_BYTES / 1024 / 1024} MB. Split it into smaller files.`;

export async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "parts:edit");
  let form: FormData;
  try {
    // the form's other fields are small: anything far past the limit is refused unread
    form = await readForm(request, {
      files: true,
      limitBytes: MAX_CSV_BYTES * 1.1 + 64 * 1024,
      fieldLimits: { csv: MAX_CSV_BYTES },
      tooLarge: TOO_BIG,
    });
  } catch (e) {
    if ((e as { init?: { status?: number } })?.init?.status === 413)
      return data<ImportData>(
        { message: TOO_BIG, check: null, csv: null, written: null },
        { status: 413 },
      );
    throw e;
  }
  const file = form.get("file");
  let csv = typeof form.get("csv") === "string" ? String(form.get("csv")) : "";
  if (file instanceof File && file.size > 0) {
    if (file.size > MAX_CSV_BYTES)
      return data<ImportData>(
        { message: TOO_BIG, check: null, csv: null, written: null },
        { status: 413 },
      );
    csv = await file.text();
  }
  const line = csv.split("\n").findIndex(hasControlChars);
  if (line >= 0)
    return data<ImportData>(
      {
        message: `Line ${line + 1} of the file contains a control character (such as a NUL byte) that cannot be stored; remove it and check the file again.`,
        check: null,
        csv: null,
        written: null,
      },
      { status: 400 },
    );
  if (!csv.trim())
    return data<ImportData>(
      { message: "Choose a CSV file to check.", check: null, csv: null, written: null },
      { status: 400 },
    );
  const db = getDb();
  if (form.get("intent") === "import") {
    const r = await importPartsCsv(db, csv, user.id);
    if (!r.ok)
      return data<ImportData>(
        { message: r.message, check: null, csv: null, written: null },
        { status: 400 },
      );
    if (r.invalid > 0)
      return data<ImportData>(
        { message: "Nothing was written: some rows are not valid.", check: r, csv, written: null },
        { status: 400 },
      );
    return { message: null, check: r, csv: null, written: r.written ?? 0 };
  }
  const check = await checkPartsCsv(db, csv);
  if (!check.ok)
    return data<ImportData>(
      { message: check.message, check: null, csv: null, written: null },
      { status: 400 },
    );
  return { message: null, check, csv, written: null };
}

export default function ImportParts({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  const check = actionData?.check && actionData.check.ok ? actionData.check : null;
  return (
    <main className="mx-auto max-w-5xl px-4 py-8">
      <PageHeader
        back={{ to: "/parts", label: "Parts catalog" }}
        title="Import parts from CSV"
        lead={`Check a file first: every row is validated like the part form, and nothing is written until you import. An import writes every row or none. Up to ${MAX_CSV_BYTES / 1024 / 1024} MB.`}
      />
      <Form
        method="post"
        encType="multipart/form-data"
        className="mt-6 flex flex-wrap items-end gap-3 rounded border border-steel-200 bg-white p-4"
      >
        <div>
          <label htmlFor="file" className="block text-sm font-semibold text-graphite">
            CSV file
          </label>
          <input
            id="file"
            name="file"
            type="file"
            accept=".csv,text/csv"
            aria-describedby="import-message"
            className="mt-1 block text-sm"
          />
        </div>
        <button
          type="submit"
          name="intent"
          value="preview"
          disabled={busy}
          className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink disabled:opacity-60"
        >
          Check the file
        </button>
      </Form>
      <div id="import-message" aria-live="polite">
        {actionData?.message ? (
          <p
            role="alert"
            className="mt-4 rounded border border-red bg-white px-3 py-2 font-medium text-red-text"
          >
            {actionData.message}
          </p>
        ) : null}
        {actionData?.written !== null && actionData?.written !== undefined ? (
          <p
            role="status"
            className="mt-4 rounded border border-green bg-white px-3 py-2 font-medium text-green-text"
          >
            Imported {actionData.written} part{actionData.written === 1 ? "" : "s"}. Each change is
            in the part's history.
          </p>
        ) : null}
      </div>
      {check && actionData?.written === null ? (
        <section aria-labelledby="check-h" className="mt-6">
          <h2 id="check-h" className="text-lg font-semibold text-ink">
            <span className="num">{check.rows.length}</span> rows:{" "}
            <span className="num text-green-text">{check.valid}</span> valid,{" "}
            <span className="num text-red-text">{check.invalid}</span> with problems
          </h2>
          {check.invalid > 0 ? (
            <ul className="mt-2 space-y-1 rounded border border-red bg-white p-3 text-sm">
              {check.rows
                .filter((r) => r.errors.length)
                .slice(0, 200)
                .map((r) => (
                  <li key={r.line}>
                    <span className="num font-semibold">Line {r.line}</span>{" "}
                    <span className="font-mono">{r.partNumber || "(no part number)"}</span>:{" "}
                    {r.errors.join("; ")}
                  </li>
                ))}
            </ul>
          ) : (
            <Form method="post" className="mt-3">
              <input type="hidden" name="csv" value={actionData?.csv ?? ""} />
              <p className="text-sm text-steel-700">
                {check.rows.filter((r) => r.action === "add").length} new,{" "}
                {check.rows.filter((r) => r.action === "update").length} updated.
              </p>
              <button
                type="submit"
                name="intent"
                value="import"
                disabled={busy}
                className="mt-2 rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink disabled:opacity-60"
              >
                Import {check.rows.length} rows
              </button>
            </Form>
          )}
        </section>
      ) : null}
      <section
        aria-labelledby="cols-h"
        className="mt-8 rounded border border-steel-200 bg-white p-4 text-sm"
      >
        <h2 id="cols-h" className="text-lg font-semibold text-ink">
          Columns
        </h2>
        <p className="mt-1 text-steel-700">
          The first line names the columns (any order). Export the catalog to get a file in this
          shape.
        </p>
        <table className="mt-2 w-full">
          <tbody>
            {CSV_COLUMNS.map((c) => (
              <tr key={c.name} className="border-t border-steel-100 align-top">
                <td className="py-1 pr-3 font-mono text-ink">{c.name}</td>
                <td className="py-1 pr-3 text-steel-700">{c.required ? "required" : "optional"}</td>
                <td className="py-1 text-graphite">{c.description}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="mt-2 text-steel-700">
          Cells that begin with = + - @ are exported with a leading apostrophe so a spreadsheet
          shows them as text.
        </p>
      </section>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Import parts · Torquewright" }];
}
