import { readForm } from "~/lib/http/body";
import { hasControlChars } from "~/lib/http/text";
import { useState } from "react";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/parts.import";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { CSV_COLUMNS, EXAMPLE_CSV, MAX_CSV_BYTES } from "~/components/catalog/csv-columns";
import { ATTRIBUTE_FIELDS, camelToSnake, unitText } from "~/lib/catalog/attributes";
import { formatNumber } from "~/lib/format";
import { categoryLabel } from "~/lib/format/labels";
import { BUILT_IN_CATEGORIES } from "~/lib/packages/slots";
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
  const [file, setFile] = useState<{ name: string; size: number } | null>(null);
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
        <div className="min-w-0 flex-1">
          <p className="block text-sm font-semibold text-graphite" id="file-h">
            CSV file
          </p>
          <div className="mt-1 flex flex-wrap items-center gap-3">
            <label
              htmlFor="file"
              className="cursor-pointer rounded border border-teal-dark bg-white px-4 py-2 font-semibold text-teal-text hover:bg-steel-50 has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-teal"
            >
              Choose a file…
              <input
                id="file"
                name="file"
                type="file"
                accept=".csv,text/csv"
                aria-labelledby="file-h"
                aria-describedby="file-chosen import-message"
                className="sr-only"
                onChange={(e) => {
                  const f = e.currentTarget.files?.[0];
                  setFile(f ? { name: f.name, size: f.size } : null);
                }}
              />
            </label>
            <span
              id="file-chosen"
              className="min-w-0 break-all text-sm text-steel-700"
              data-testid="file-chosen"
            >
              {file ? (
                <>
                  <span className="font-semibold text-ink">{file.name}</span> ·{" "}
                  <span className="num">{fileSize(file.size)}</span>
                </>
              ) : (
                "No file chosen yet"
              )}
            </span>
          </div>
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
          The first line names the columns, in any order. The easiest start is the example row
          below, or an export of the catalog.
        </p>
        <p className="mt-2">
          <a
            href={`data:text/csv;charset=utf-8,${encodeURIComponent(EXAMPLE_CSV)}`}
            download="example-parts.csv"
            className="font-semibold text-teal-text underline"
          >
            Download an example row (CSV)
          </a>
        </p>
        <dl className="mt-3 divide-y divide-steel-100">
          {CSV_COLUMNS.map((c) => (
            <div key={c.name} className="py-1.5 sm:grid sm:grid-cols-[11rem_1fr] sm:gap-3">
              <dt>
                <code className="font-mono text-ink">{c.name}</code>{" "}
                <span className="text-xs text-steel-700">
                  {c.required ? "needed" : "may be empty"}
                </span>
              </dt>
              <dd className="text-graphite">{c.description}</dd>
            </div>
          ))}
        </dl>
        <h3 className="mt-4 font-semibold text-ink">Kinds of part and their measurements</h3>
        <p className="text-steel-700">
          Write the kind in the <code className="font-mono">category</code> column and the
          measurements in the <code className="font-mono">attributes</code> column, for example{" "}
          <code className="font-mono">bore_mm=104.8</code>.
        </p>
        <ul className="mt-2 grid gap-1 sm:grid-cols-2">
          {BUILT_IN_CATEGORIES.map((k) => {
            const attrs = ATTRIBUTE_FIELDS[k.slug] ?? [];
            return (
              <li key={k.slug} className="rounded border border-steel-100 px-2 py-1">
                <span className="font-semibold text-ink">{categoryLabel(k.slug)}</span>:{" "}
                <code className="font-mono break-all">{k.slug}</code>
                {attrs.length > 0 ? (
                  <span className="block text-xs text-steel-700">
                    {attrs.map((f, i) => (
                      <span key={f.key}>
                        {i > 0 ? "; " : ""}
                        {f.label.toLowerCase()}{" "}
                        <code className="font-mono break-all">{camelToSnake(f.key)}</code> (
                        {unitText(f.unit)}){f.required ? "" : ", optional"}
                      </span>
                    ))}
                  </span>
                ) : null}
              </li>
            );
          })}
        </ul>
        <p className="mt-2 text-steel-700">
          A cell that begins with = + - or @ is exported with an apostrophe in front, so a
          spreadsheet shows it as text instead of running it.
        </p>
      </section>
    </main>
  );
}

function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${formatNumber(bytes / 1024, 0, 1)} KB`;
  return `${formatNumber(bytes / 1024 / 1024, 0, 1)} MB`;
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Import parts · Torquewright" }];
}
