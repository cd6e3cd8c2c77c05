import { randomBytes } from "node:crypto";
import Papa from "papaparse";
import { sql } from "kysely";
import { beforeAll, describe, expect, it, vi } from "vitest";
import {
  ensureBuiltInCategories,
  getPartByNumber,
  getPartHistory,
} from "~/lib/catalog/parts.server";
import { MAX_CSV_ROWS, neutralise, unneutralise } from "~/lib/catalog/csv.server";
import { getDb } from "~/lib/db.server";
import { action as importAction } from "~/routes/parts.import";
import { loader as exportLoader } from "~/routes/parts.export[.]csv";
import { args, run } from "../support/route";
import { createTestUser, requestAs, type TestUser } from "../support/auth";

const db = getDb();
const users = {} as Record<"owner" | "builder" | "apprentice", TestUser>;
const uniq = () => randomBytes(4).toString("hex").toUpperCase();

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  for (const r of ["owner", "builder", "apprentice"] as const)
    users[r] = await createTestUser(db, r);
});

async function upload(who: TestUser, csv: string | Blob, intent = "preview") {
  const body = new FormData();
  body.set("intent", intent);
  body.set("file", new File([csv], "parts.csv", { type: "text/csv" }));
  return run(async () =>
    importAction(args(await requestAs(who, "/parts/import", { method: "POST", body }))),
  );
}
async function importText(who: TestUser, csv: string) {
  const body = new FormData();
  body.set("intent", "import");
  body.set("csv", csv);
  return run(async () =>
    importAction(args(await requestAs(who, "/parts/import", { method: "POST", body }))),
  );
}

const HEAD = "part_number,category,maker,name,price,labour_hours,tags,stock,attributes,notes";

describe("CSV import", () => {
  it("a good file previews without writing, then imports every row in one go", async () => {
    const a = `TW-CSV-${uniq()}`;
    const b = `TW-CSV-${uniq()}`;
    const csv = `${HEAD}\n${a},cylinders,Ironvale,Pair 104.8,1349.00,6.5,big-bore|plated,no,boreMm=104.8,\n${b},head_gaskets,Quenchline Components,MLS 105.4,95,0.5,mls,no,bore_mm=105.4;compressed_thickness_mm=1.02,"thin, for quench"\n`;
    const preview = await upload(users.owner, csv);
    expect(preview.status).toBe(200);
    expect(preview.value.check).toMatchObject({ ok: true, valid: 2, invalid: 0 });
    expect(await getPartByNumber(db, a)).toBeUndefined();
    const done = await importText(users.owner, preview.value.csv);
    expect(done.value.written).toBe(2);
    const gasket = await getPartByNumber(db, b);
    expect(gasket).toMatchObject({
      attributes: { boreMm: 105.4, compressedThicknessMm: 1.02 },
      notes: "thin, for quench",
      price_cents: 9500,
    });
    expect((await getPartHistory(db, gasket!.id))[0]!.change).toBe("Added by CSV import");
  });

  it("upserts by part number: a second import updates and versions the part", async () => {
    const a = `TW-CSV-${uniq()}`;
    await importText(
      users.owner,
      `${HEAD}\n${a},risers,Corrie Bend Cycle,Bars 14,449,4,tall-bars,no,heightIn=14,`,
    );
    await importText(
      users.owner,
      `${HEAD}\n${a.toLowerCase()},risers,Corrie Bend Cycle,Bars 14 in,459,4,tall-bars,no,heightIn=14,`,
    );
    const p = await getPartByNumber(db, a);
    expect(p).toMatchObject({
      part_number: a.toLowerCase(),
      name: "Bars 14 in",
      price_cents: 45900,
      version: 2,
    });
  });

  it("a file with bad rows lists every invalid row with its reason and writes nothing", async () => {
    const good = `TW-CSV-${uniq()}`;
    const csv = [
      HEAD,
      `${good},cylinders,Ironvale,Fine,100,1,,no,boreMm=101.6,`,
      `TW-CSV-${uniq()},cylinders,Ironvale,Too big,100,1,,no,boreMm=150,`,
      `TW-CSV-${uniq()},nonsense,Ironvale,Odd category,100,1,,no,,`,
      `TW-CSV-${uniq()},cams,Ironvale,Missing lift,abc,1,,maybe,intakeClosesAbdcDeg=40,`,
      `,cylinders,Ironvale,No number,100,1,,no,boreMm=101.6,`,
      `TW-CSV-${uniq()},cylinders,Ironvale,Wrong key,100,1,Bad Tag!,no,strokeMm=114,`,
    ].join("\n");
    const r = await upload(users.owner, csv);
    const rows = r.value.check.rows as Array<{ line: number; errors: string[] }>;
    expect(r.value.check).toMatchObject({ valid: 1, invalid: 5 });
    const errs = (line: number) => rows.find((x) => x.line === line)!.errors.join(" | ");
    expect(errs(3)).toMatch(/attributes.boreMm: Bore must be between 50 and 130 mm/);
    expect(errs(4)).toMatch(/category: Choose one of the listed categories/);
    expect(errs(5)).toMatch(/stock: "maybe" is not yes or no/);
    expect(errs(5)).toMatch(/price: Price must be a number/);
    expect(errs(5)).toMatch(/Enter the intake lift in mm/);
    expect(errs(6)).toMatch(/part_number: Enter the shop's part number|part_number/);
    expect(errs(7)).toMatch(/cylinders parts have no "strokeMm"/);
    const written = await importText(users.owner, csv);
    expect(written.status).toBe(400);
    expect(await getPartByNumber(db, good)).toBeUndefined();
  });

  it("refuses wrong columns with the names", async () => {
    const r = await upload(users.owner, "sku,description,cost\nA,B,1\n");
    expect(r.status).toBe(400);
    expect(r.value.message).toMatch(
      /missing columns: part_number, category, maker, name, price; unknown columns: sku, description, cost/,
    );
  });

  it("refuses 5 MB of junk with a clear message", async () => {
    const junk = randomBytes(5 * 1024 * 1024)
      .toString("base64")
      .slice(0, 5 * 1024 * 1024);
    const r = await upload(users.owner, junk);
    expect(r.status).toBe(413);
    expect(r.value.message).toBe("The file is larger than 2 MB. Split it into smaller files.");
  });

  it("refuses the same part number twice in one file, whatever the case, and writes nothing", async () => {
    const pn = `TW-CSV-${uniq()}`;
    const csv = [
      HEAD,
      `${pn},cylinders,Ironvale,First,100,1,,no,boreMm=101.6,`,
      `${pn.toLowerCase()},cylinders,Ironvale,Second,100,1,,no,boreMm=101.6,`,
    ].join("\n");
    const r = await upload(users.owner, csv);
    expect(r.value.check).toMatchObject({ valid: 1, invalid: 1 });
    expect(r.value.check.rows[1]).toMatchObject({
      line: 3,
      errors: [`part_number: ${pn.toLowerCase()} appears again (line 2)`],
    });
    expect((await importText(users.owner, csv)).status).toBe(400);
    expect(await getPartByNumber(db, pn)).toBeUndefined();
  });

  it("refuses a header with no rows, and more rows than the limit, with the reason", async () => {
    const empty = await upload(users.owner, `${HEAD}\n\n`);
    expect([empty.status, empty.value.message]).toEqual([
      400,
      "The file has a header but no rows.",
    ]);
    const pn = `TW-CSV-${uniq()}`;
    const rows = Array.from(
      { length: MAX_CSV_ROWS + 1 },
      (_, i) => `${pn}-${i},cylinders,Ironvale,Pair,100,1,,no,boreMm=101.6,`,
    );
    const over = await upload(users.owner, [HEAD, ...rows].join("\n"));
    expect([over.status, over.value.message]).toEqual([
      400,
      `The file has ${MAX_CSV_ROWS + 1} rows; the limit is ${MAX_CSV_ROWS}.`,
    ]);
    expect(await getPartByNumber(db, `${pn}-0`)).toBeUndefined();
  });

  it("names each malformed attribute", async () => {
    const line = (attrs: string) =>
      `TW-CSV-${uniq()},head_gaskets,Ironvale,Gasket,95,0.5,,no,"${attrs}",`;
    const csv = [
      HEAD,
      line("boreMm;compressedThicknessMm=1.02"),
      line("=105.4;compressedThicknessMm=1.02"),
      line("boreMm=abc;compressedThicknessMm=1.02"),
      line("boreMm=105.4=2;compressedThicknessMm=1.02"),
      line("boreMm=105.4;bore_mm=99;compressedThicknessMm=1.02;"),
      line(" boreMm = 105.4 ; compressed_thickness_mm=1.02 ;"),
    ].join("\n");
    const r = await upload(users.owner, csv);
    const rows = r.value.check.rows as Array<{ line: number; errors: string[] }>;
    expect(rows.map((x) => [x.line, x.errors])).toEqual([
      [
        2,
        ['attributes: "boreMm" is not key=value', "attributes.boreMm: Enter the gasket bore in mm"],
      ],
      [
        3,
        ['attributes: "=105.4" is not key=value', "attributes.boreMm: Enter the gasket bore in mm"],
      ],
      [4, ["attributes.boreMm: Gasket bore must be a number"]],
      [5, ["attributes.boreMm: Gasket bore must be a number"]],
      // the same attribute twice (in either spelling) is not guessed at
      [6, ['attributes: "bore_mm" is given twice']],
      // spaces around names, values and separators are fine
      [7, []],
    ]);
  });

  it("reads a byte-order mark, header names in any case and a dollar sign in prices", async () => {
    const pn = `TW-CSV-${uniq()}`;
    const csv = `\uFEFF${HEAD.toUpperCase().replace("NAME,", "Name,")}\r\n${pn},cylinders,Ironvale,Pair,$1349.50,6.5,,no,boreMm=104.8,\r\n`;
    const r = await importText(users.owner, csv);
    expect(r.value.written).toBe(1);
    expect(await getPartByNumber(db, pn)).toMatchObject({ price_cents: 134950, name: "Pair" });
    // other currency signs and thousands separators are not guessed at
    const other = await upload(
      users.owner,
      `${HEAD}\n${pn}-E,cylinders,Ironvale,Pair,€1349,1,,no,boreMm=104.8,\n${pn}-K,cylinders,Ironvale,Pair,"1,349.00",1,,no,boreMm=104.8,`,
    );
    expect((other.value.check.rows as Array<{ errors: string[] }>).map((x) => x.errors)).toEqual([
      ["price: Price must be a number"],
      ["price: Price must be a number"],
    ]);
  });

  it("an import over an archived part updates it, and it stays archived", async () => {
    const pn = `TW-CSV-${uniq()}`;
    await importText(users.owner, `${HEAD}\n${pn},cylinders,Ironvale,Pair,100,1,,no,boreMm=101.6,`);
    const part = (await getPartByNumber(db, pn))!;
    await db
      .updateTable("parts")
      .set({ archived_at: new Date() })
      .where("id", "=", part.id)
      .execute();
    const r = await upload(
      users.owner,
      `${HEAD}\n${pn},cylinders,Ironvale,Pair again,110,1,,no,boreMm=101.6,`,
    );
    expect(r.value.check.rows[0]).toMatchObject({ action: "update", errors: [] });
    await importText(
      users.owner,
      `${HEAD}\n${pn},cylinders,Ironvale,Pair again,110,1,,no,boreMm=101.6,`,
    );
    const after = (await getPartByNumber(db, pn))!;
    expect({
      name: after.name,
      price: after.price_cents,
      archived: after.archived_at !== null,
    }).toEqual({ name: "Pair again", price: 11000, archived: true });
  });

  it("a failure inside the write transaction leaves nothing behind", async () => {
    const a = `TW-CSV-${uniq()}`;
    const b = `TW-CSV-${uniq()}`;
    const fails = `TW-CSV-${uniq()}`;
    await importText(
      users.owner,
      `${HEAD}\n${b},cylinders,Ironvale,Before,100,1,,no,boreMm=101.6,`,
    );
    const fn = `tw_test_fail_${fails.replace(/-/g, "_").toLowerCase()}`;
    // the third row passes every check but the database refuses it while writing
    await sql
      .raw(
        `create function ${fn}() returns trigger language plpgsql as $$ begin
           if new.part_number = '${fails}' then raise exception 'refused while writing'; end if;
           return new; end $$;
         create trigger ${fn} before insert on parts for each row execute function ${fn}();`,
      )
      .execute(db);
    try {
      const csv = [
        HEAD,
        `${a},cylinders,Ironvale,New,100,1,,no,boreMm=101.6,`,
        `${b},cylinders,Ironvale,After,120,1,,no,boreMm=101.6,`,
        `${fails},cylinders,Ironvale,Refused,100,1,,no,boreMm=101.6,`,
      ].join("\n");
      const spy = vi.spyOn(console, "error").mockImplementation(() => {});
      await expect(importText(users.owner, csv)).rejects.toThrow(/refused while writing/);
      spy.mockRestore();
    } finally {
      await sql.raw(`drop trigger ${fn} on parts; drop function ${fn}();`).execute(db);
    }
    expect(await getPartByNumber(db, a)).toBeUndefined();
    const kept = (await getPartByNumber(db, b))!;
    expect([kept.name, kept.version]).toEqual(["Before", 1]);
    expect(await getPartHistory(db, kept.id)).toHaveLength(1);
  });

  it("only the owner imports", async () => {
    const r = await upload(users.builder, `${HEAD}\n`);
    expect(r.status).toBe(403);
  });
});

describe("CSV export", () => {
  it("neutralises formula cells and round-trips through the import", async () => {
    const pn = `TW-CSV-${uniq()}`;
    const evil = "=cmd|' /C calc'!A0";
    await importText(
      users.owner,
      Papa.unparse({
        fields: HEAD.split(","),
        data: [[pn, "brake_lines", "@Ashgrove", evil, "12", "1", "", "no", "", "+1 call"]],
      }),
    );
    expect((await getPartByNumber(db, pn))?.name).toBe(evil);
    const res = (
      await run(async () => exportLoader(args(await requestAs(users.owner, "/parts/export.csv"))))
    ).value as Response;
    expect(res.headers.get("Content-Type")).toMatch(/text\/csv/);
    const text = await res.text();
    const rows = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
      header: true,
      skipEmptyLines: true,
    }).data;
    const row = rows.find((r) => r.part_number === pn)!;
    expect(row.name).toBe(`'${evil}`);
    expect(row.maker).toBe("'@Ashgrove");
    expect(row.notes).toBe("'+1 call");
    expect(row.price).toBe("12.00");
    for (const r of rows)
      for (const cell of Object.values(r)) expect(cell).not.toMatch(/^[=+\-@\t\r]/);

    // this part's exported line imported again gives the same part back
    const lines = text.replace(/^\uFEFF/, "").split("\r\n");
    const mine = lines.find((l) => l.startsWith(`${pn},`))!;
    const back = await importText(users.owner, `${lines[0]}\r\n${mine}\r\n`);
    expect(back.value.written).toBe(1);
    const again = (await getPartByNumber(db, pn))!;
    expect([again.name, again.maker, again.notes, again.price_cents, again.category]).toEqual([
      evil,
      "@Ashgrove",
      "+1 call",
      1200,
      "brake_lines",
    ]);
  });

  it("leaves the price column out for apprentices", async () => {
    const res = (
      await run(async () =>
        exportLoader(args(await requestAs(users.apprentice, "/parts/export.csv"))),
      )
    ).value as Response;
    const header = (await res.text()).replace(/^\uFEFF/, "").split(/\r?\n/)[0]!;
    expect(header.split(",")).not.toContain("price");
    expect(header.split(",")).toContain("part_number");
  });

  it("neutralise() prefixes exactly the dangerous first characters", () => {
    expect(
      ["=1", "+1", "-1", "@x", "\tx", "\rx", "x=1", "1", "", "'=1", "''", "'78 style"].map(
        neutralise,
      ),
    ).toEqual([
      "'=1",
      "'+1",
      "'-1",
      "'@x",
      "'\tx",
      "'\rx",
      "x=1",
      "1",
      "",
      "''=1",
      "'''",
      "'78 style",
    ]);
    // and the import takes exactly that apostrophe off again
    for (const cell of ["=1", "-1", "'=1", "''", "'78 style", "'", "x", ""])
      expect(unneutralise(neutralise(cell))).toBe(cell);
  });
});
