// The parts catalog as CSV: our own columns, validated row by row with the same schemas
// as the part form, written all or nothing.
import Papa from "papaparse";
import type { Kysely } from "kysely";
import type { Database, Part } from "../../../db/schema";
import { createPart, getPartByNumber, listCategories, updatePart } from "./parts.server";
import { attributeFieldsFor, partSchemaFor, snakeToCamel, type PartInput } from "./attributes";

export { CSV_COLUMNS, MAX_CSV_BYTES, MAX_CSV_ROWS } from "~/components/catalog/csv-columns";
import { CSV_COLUMNS, MAX_CSV_BYTES, MAX_CSV_ROWS } from "~/components/catalog/csv-columns";

const KNOWN = new Set<string>(CSV_COLUMNS.map((c) => c.name));

/**
 * Cells that a spreadsheet would run as a formula get a leading apostrophe; so does a cell
 * that already starts with an apostrophe before such a character, so that the import
 * (`unneutralise`) gives back exactly what was exported.
 */
export function neutralise(cell: string): string {
  return /^([=+\-@\t\r]|'[=+\-@\t\r'])/.test(cell) ? `'${cell}` : cell;
}

/** The import's reverse of `neutralise`: drops the apostrophe it added. */
export function unneutralise(cell: string): string {
  return /^'[=+\-@\t\r']/.test(cell) ? cell.slice(1) : cell;
}

export function partsToCsv(parts: Part[], showPrices: boolean): string {
  const fields = CSV_COLUMNS.map((c) => c.name).filter((n) => showPrices || n !== "price");
  const rows = parts.map((p) => {
    const row: Record<string, string> = {
      part_number: p.part_number,
      category: p.category,
      maker: p.maker,
      name: p.name,
      price: (p.price_cents / 100).toFixed(2),
      labour_hours: String(Number(p.labour_hours)),
      tags: p.tags.join("|"),
      stock: p.stock ? "yes" : "no",
      attributes: Object.entries(p.attributes as Record<string, unknown>)
        .map(([k, v]) => `${k}=${v}`)
        .join(";"),
      notes: p.notes,
    };
    return fields.map((f) => neutralise(row[f] ?? ""));
  });
  return Papa.unparse({ fields, data: rows }, { quotes: false, newline: "\r\n" });
}

export type CsvRowResult = {
  line: number;
  partNumber: string;
  action: "add" | "update";
  errors: string[];
  input?: PartInput;
};
export type CsvCheck =
  | { ok: false; message: string }
  | { ok: true; rows: CsvRowResult[]; valid: number; invalid: number };

function parseAttributes(
  category: string,
  text: string,
  errors: string[],
): Record<string, number | undefined> {
  const out: Record<string, number | undefined> = {};
  const allowed = new Map(attributeFieldsFor(category).map((f) => [f.key, f]));
  for (const pair of text
    .split(";")
    .map((s) => s.trim())
    .filter(Boolean)) {
    const eq = pair.indexOf("=");
    if (eq <= 0) {
      errors.push(`attributes: "${pair.slice(0, 40)}" is not key=value`);
      continue;
    }
    const rawKey = pair.slice(0, eq).trim();
    const key = rawKey.includes("_") ? snakeToCamel(rawKey) : rawKey;
    if (!allowed.has(key)) {
      errors.push(
        `attributes: ${category} parts have no "${rawKey.slice(0, 40)}"${allowed.size ? ` (they have ${[...allowed.keys()].join(", ")})` : ""}`,
      );
      continue;
    }
    if (Object.hasOwn(out, key)) {
      errors.push(`attributes: "${rawKey.slice(0, 40)}" is given twice`);
      continue;
    }
    const raw = pair.slice(eq + 1).trim();
    const n = raw === "" ? Number.NaN : Number(raw);
    out[key] = Number.isFinite(n) ? n : (raw as unknown as number); // the schema names a non-number
  }
  return out;
}

function yes(v: string | undefined): boolean | null {
  const s = (v ?? "").trim().toLowerCase();
  if (s === "" || s === "no" || s === "false" || s === "0" || s === "n") return false;
  if (s === "yes" || s === "true" || s === "1" || s === "y") return true;
  return null;
}

/** Parses and checks every row; writes nothing. */
export async function checkPartsCsv(db: Kysely<Database>, text: string): Promise<CsvCheck> {
  if (new TextEncoder().encode(text).length > MAX_CSV_BYTES)
    return {
      ok: false,
      message: `The file is larger than ${MAX_CSV_BYTES / 1024 / 1024} MB. Split it into smaller files.`,
    };
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim().toLowerCase(),
    transform: (v) => unneutralise(v),
  });
  const headers = parsed.meta.fields ?? [];
  const missing = CSV_COLUMNS.filter((c) => c.required && !headers.includes(c.name)).map(
    (c) => c.name,
  );
  const unknown = headers.filter((h) => !KNOWN.has(h));
  if (missing.length || unknown.length) {
    const parts = [
      missing.length ? `missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}` : "",
      unknown.length
        ? `unknown column${unknown.length > 1 ? "s" : ""}: ${unknown
            .slice(0, 8)
            .map((u) => u.slice(0, 30))
            .join(", ")}`
        : "",
    ].filter(Boolean);
    return {
      ok: false,
      message: `The columns do not match the catalog's (${parts.join("; ")}). The first line must name the columns listed on this page.`,
    };
  }
  if (parsed.data.length === 0) return { ok: false, message: "The file has a header but no rows." };
  if (parsed.data.length > MAX_CSV_ROWS)
    return {
      ok: false,
      message: `The file has ${parsed.data.length} rows; the limit is ${MAX_CSV_ROWS}.`,
    };
  const slugs = (await listCategories(db)).map((c) => c.slug);
  const seen = new Map<string, number>();
  const rows: CsvRowResult[] = [];
  for (const [i, r] of parsed.data.entries()) {
    const line = i + 2;
    const errors: string[] = [];
    const category = (r.category ?? "").trim();
    const stock = yes(r.stock);
    if (stock === null) errors.push(`stock: "${(r.stock ?? "").slice(0, 20)}" is not yes or no`);
    const num = (v: string | undefined) =>
      v === undefined || v.trim() === "" ? undefined : Number(v.trim().replace(/^\$/, ""));
    const candidate = {
      part_number: (r.part_number ?? "").trim() || undefined,
      category: category || undefined,
      maker: r.maker,
      name: r.name,
      price: num(r.price),
      labour_hours: num(r.labour_hours),
      tags: (r.tags ?? "").split("|").join(" "),
      stock: stock ?? false,
      notes: r.notes ?? "",
      attributes: parseAttributes(category, r.attributes ?? "", errors),
    };
    const result = partSchemaFor(category, slugs).safeParse(candidate);
    if (!result.success)
      for (const issue of result.error.issues)
        errors.push(`${issue.path.join(".") || "row"}: ${issue.message}`);
    const pn = (r.part_number ?? "").trim();
    const key = pn.toLowerCase();
    if (pn && seen.has(key))
      errors.push(`part_number: ${pn} appears again (line ${seen.get(key)})`);
    seen.set(key, line);
    const existing = pn ? await getPartByNumber(db, pn) : undefined;
    const row: CsvRowResult = { line, partNumber: pn, action: existing ? "update" : "add", errors };
    if (result.success && errors.length === 0) row.input = result.data;
    rows.push(row);
  }
  const invalid = rows.filter((r) => r.errors.length).length;
  return { ok: true, rows, valid: rows.length - invalid, invalid };
}

/** Writes every row in one transaction, or nothing when any row is invalid. */
export async function importPartsCsv(
  db: Kysely<Database>,
  text: string,
  userId: number | null,
): Promise<CsvCheck & { written?: number }> {
  const check = await checkPartsCsv(db, text);
  if (!check.ok || check.invalid > 0) return check;
  await db.transaction().execute(async (trx) => {
    for (const row of check.rows) {
      const input = row.input!;
      const existing = await getPartByNumber(trx, input.part_number);
      if (existing)
        await updatePart(trx, existing.id, input, null, userId, "Updated by CSV import");
      else await createPart(trx, input, userId, "Added by CSV import");
    }
  });
  return { ...check, written: check.rows.length };
}
