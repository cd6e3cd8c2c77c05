import { randomBytes } from "node:crypto";
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import {
  ensureBuiltInCategories,
  getPartByNumber,
  getPartHistory,
} from "~/lib/catalog/parts.server";
import { neutralise } from "~/lib/catalog/csv.server";
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
    expect(r.value.message).toMatch(/larger than 2 MB/);
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
    expect(["=1", "+1", "-1", "@x", "\tx", "\rx", "x=1", "1", ""].map(neutralise)).toEqual([
      "'=1",
      "'+1",
      "'-1",
      "'@x",
      "'\tx",
      "'\rx",
      "x=1",
      "1",
      "",
    ]);
  });
});
