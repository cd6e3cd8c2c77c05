// The working copy, its edit log and named revisions, through the bench's and the
// overview's own actions against the test database: edits of one session fold into one
// revision; another editor, a status change, the quiet period or a note close it; compare
// and restore work on revisions and single edits; a stale base is refused; and revisions
// saved before the edit log migrate as they were.
import { randomBytes } from "node:crypto";
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { Kysely, sql } from "kysely";
import pg from "pg";
import { createDb } from "../../db/connect";
import * as core from "../../db/migrations/20261201T2200_core";
import * as catalog from "../../db/migrations/20261201T2230_catalog";
import * as auth from "../../db/migrations/20261201T2235_auth";
import * as packagesMigration from "../../db/migrations/20261201T2300_packages";
import * as workingCopy from "../../db/migrations/20261202T1530_working_copy";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createPackage, saveEdit } from "~/lib/packages/store.server";
import { listRevisions } from "~/lib/packages/revisions.server";
import { clock, quietMinutes } from "~/lib/packages/revisions-log.server";
import { emptySpec } from "~/lib/bench/spec";
import { action as benchAction } from "~/routes/packages.$id.bench";
import { action as overviewAction, loader as overviewLoader } from "~/routes/packages.$id";
import { createTestUser, requestAs, type TestUser } from "../support/auth";
import { testDatabaseUrl, withDatabase } from "../support/db-url";

// every migration, by file name (their order); the migration test runs those after the
// working copy's once it has checked what that one did
const migrations = import.meta.glob<{ up: (db: Kysely<any>) => Promise<void> }>(
  "../../db/migrations/*.ts",
);
const WORKING_COPY_FILE = "../../db/migrations/20261202T1530_working_copy.ts";

const db = getDb();
const tag = randomBytes(4).toString("hex");
let builder: TestUser;
let owner: TestUser;
let writer: TestUser;
let bikeId = 0;
const part: Record<string, number> = {};
const realNow = clock.now;
afterEach(() => {
  clock.now = realNow;
});

async function addPart(key: string, category: string, attributes: Record<string, number>) {
  const row = await db
    .insertInto("parts")
    .values({
      part_number: `RV-${tag}-${key}`,
      category,
      maker: "Test Works",
      name: `Revision test ${key}`,
      price_cents: 5000,
      tags: [],
      stock: false,
      attributes: JSON.stringify(attributes),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  part[key] = row.id;
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [builder, owner, writer] = await Promise.all([
    createTestUser(db, "builder"),
    createTestUser(db, "owner"),
    createTestUser(db, "service_writer"),
  ]);
  const c = await db
    .insertInto("customers")
    .values({ name: `Revisions ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  bikeId = (
    await db
      .insertInto("bikes")
      .values({ customer_id: c.id, year: 2018, model: `Revision twin ${tag}`, notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await addPart("cyl", "cylinders", { boreMm: 101.6 });
  await addPart("cylbig", "cylinders", { boreMm: 104.8 });
  await addPart("fly", "flywheels", { strokeMm: 114.3 });
  await addPart("head", "heads", { chamberCc: 89 });
});

const newPackage = (name: string) =>
  createPackage(
    db,
    { name: `${name} ${tag}`, bikeId, isTemplate: false, builderId: builder.id },
    builder.id,
  );

async function answer(p: Promise<unknown>): Promise<{ status: number; body: any }> {
  let v: unknown;
  try {
    v = await p;
  } catch (thrown) {
    v = thrown;
  }
  const d = v as { type?: string; data?: any; init?: { status?: number } };
  if (d && d.type === "DataWithResponseInit") {
    const body =
      typeof d.data?.saved === "string" ? { ...d.data, state: JSON.parse(d.data.saved) } : d.data;
    return { status: d.init?.status ?? 200, body };
  }
  return { status: 200, body: v };
}

async function post(
  user: TestUser,
  id: number,
  fields: Record<string, string>,
  route: "bench" | "overview" = "bench",
) {
  const url = route === "bench" ? `/packages/${id}/bench` : `/packages/${id}`;
  const request = await requestAs(user, url, { method: "POST", body: new URLSearchParams(fields) });
  const fn = (route === "bench" ? benchAction : overviewAction) as (a: never) => Promise<unknown>;
  return answer(fn({ request, params: { id: String(id) }, context: {} } as never));
}

const versionOf = async (id: number) =>
  (await db.selectFrom("packages").select("version").where("id", "=", id).executeTakeFirstOrThrow())
    .version;

/** One bench edit based on the working copy's current version; expects it saved. */
async function edit(user: TestUser, id: number, fields: Record<string, string>) {
  const out = await post(user, id, { ...fields, expectedRevision: String(await versionOf(id)) });
  expect(out.status, JSON.stringify(out.body)).toBe(200);
  return out.body.state as { version: number; revision: number; revisionEdits: number };
}

const setRev = (value: string) => ({
  intent: "set-number",
  field: "revLimitRpm",
  value,
  unit: "rpm",
});

describe("working copy and revisions", () => {
  it("folds 30 edits of one session into one revision holding all 30, each in the edit log", async () => {
    const id = await newPackage("Thirty");
    let last = { version: 1, revision: 1, revisionEdits: 1 };
    for (let i = 0; i < 30; i++) last = await edit(builder, id, setRev(String(5000 + i * 10)));
    expect(last).toMatchObject({ version: 31, revision: 2, revisionEdits: 30 });
    const revs = await listRevisions(db, id);
    expect(revs.map((r) => [r.revision, r.edits.length, r.closedAt === null])).toEqual([
      [2, 30, true],
      [1, 1, false],
    ]);
    expect(revs[0]!.editor).toBe(builder.name);
    expect(revs[1]).toMatchObject({ closeReason: "started", change: "Package started" });
    const log = await db
      .selectFrom("package_edits")
      .select(["version", "revision", "user_id", "change", "intent"])
      .where("package_id", "=", id)
      .orderBy("version")
      .execute();
    expect(log).toHaveLength(31);
    expect(log.map((e) => e.version)).toEqual(Array.from({ length: 31 }, (_, i) => i + 1));
    expect(log.slice(1).every((e) => e.revision === 2 && e.user_id === builder.id)).toBe(true);
    expect(log[30]).toMatchObject({
      change: "Rev limit: 5290",
      intent: { intent: "set-number", field: "revLimitRpm", value: 5290 },
    });
    // the open revision's content is the working copy; nothing is copied while it is open
    const open = await db
      .selectFrom("package_revisions")
      .select(["spec", "closed_at"])
      .where("package_id", "=", id)
      .where("revision", "=", 2)
      .executeTakeFirstOrThrow();
    expect(open).toEqual({ spec: null, closed_at: null });
  });

  it("closes the first user's open revision when another user starts editing", async () => {
    const id = await newPackage("Two editors");
    await edit(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cyl) });
    await edit(builder, id, { intent: "set-part", slot: "flywheel", partId: String(part.fly) });
    const before = await db
      .selectFrom("packages")
      .select(["spec", "results"])
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    const theirs = await edit(owner, id, setRev("6200"));
    expect(theirs).toMatchObject({ version: 4, revision: 3, revisionEdits: 1 });
    const closed = await db
      .selectFrom("package_revisions")
      .select(["close_reason", "closed_by", "saved_by", "spec", "results", "closed_at"])
      .where("package_id", "=", id)
      .where("revision", "=", 2)
      .executeTakeFirstOrThrow();
    expect(closed).toMatchObject({
      close_reason: "other_editor",
      closed_by: owner.id,
      saved_by: builder.id,
      spec: before.spec,
      results: before.results,
    });
    const revs = await listRevisions(db, id);
    expect(revs.map((r) => [r.revision, r.editor, r.edits.map((e) => e.version)])).toEqual([
      [3, owner.name, [4]],
      [2, builder.name, [3, 2]],
      [1, builder.name, [1]],
    ]);
  });

  it("closes the open revision when the package changes status", async () => {
    const id = await newPackage("Status closes");
    await edit(builder, id, { intent: "set-part", slot: "head", partId: String(part.head) });
    const moved = await post(writer, id, { intent: "status", to: "quoted" }, "overview");
    expect(moved.status).toBe(200);
    const r2 = await db
      .selectFrom("package_revisions")
      .select(["close_reason", "closed_by"])
      .where("package_id", "=", id)
      .where("revision", "=", 2)
      .executeTakeFirstOrThrow();
    expect(r2).toEqual({ close_reason: "status", closed_by: writer.id });
    // a quoted package is still editable: the next edit, same builder, opens revision 3
    expect(await edit(builder, id, setRev("5900"))).toMatchObject({
      revision: 3,
      revisionEdits: 1,
    });
  });

  it("closes the open revision once the shop's quiet period has passed since its last edit", async () => {
    const id = await newPackage("Quiet");
    const quiet = await quietMinutes(db);
    const t0 = Date.now();
    clock.now = () => new Date(t0);
    await edit(builder, id, setRev("5000"));
    // a minute short of the quiet period: the same revision
    clock.now = () => new Date(t0 + (quiet - 1) * 60_000);
    expect(await edit(builder, id, setRev("5100"))).toMatchObject({
      revision: 2,
      revisionEdits: 2,
    });
    const lastEdit = t0 + (quiet - 1) * 60_000;
    // the list already shows it closed once the period is over, before anything is written
    clock.now = () => new Date(lastEdit + quiet * 60_000 + 1000);
    const shown = (await listRevisions(db, id))[0]!;
    expect(shown).toMatchObject({
      revision: 2,
      closeReason: "quiet",
      closedAt: new Date(lastEdit + quiet * 60_000).toISOString(),
    });
    expect(await edit(builder, id, setRev("5200"))).toMatchObject({
      revision: 3,
      revisionEdits: 1,
    });
    const r2 = await db
      .selectFrom("package_revisions")
      .select(["close_reason", "closed_at", "closed_by"])
      .where("package_id", "=", id)
      .where("revision", "=", 2)
      .executeTakeFirstOrThrow();
    expect(r2).toEqual({
      close_reason: "quiet",
      closed_at: new Date(lastEdit + quiet * 60_000),
      closed_by: null,
    });
  });

  it("closes a revision with the builder's note, refusing an empty note beside its field and a stale page", async () => {
    const id = await newPackage("Note");
    await edit(builder, id, setRev("5600"));
    const v = await versionOf(id);
    const empty = await post(builder, id, {
      intent: "close-revision",
      note: "  ",
      expectedVersion: String(v),
    });
    expect(empty.status).toBe(400);
    expect(empty.body.result.error.note).toEqual(["Write a short note saying why"]);
    const stale = await post(builder, id, {
      intent: "close-revision",
      note: "First pass",
      expectedVersion: String(v - 1),
    });
    expect(stale.status).toBe(409);
    expect(stale.body.result.error[""]).toEqual([
      "Someone saved an edit since this page was loaded; look at it, then close again.",
    ]);
    expect(
      (await post(writer, id, { intent: "close-revision", note: "x", expectedVersion: String(v) }))
        .status,
    ).toBe(403);
    const ok = await post(builder, id, {
      intent: "close-revision",
      note: "106.4 bore, thinner gasket for 10.5:1",
      expectedVersion: String(v),
    });
    expect(ok.status).toBe(200);
    expect(ok.body.closed).toEqual({
      revision: 2,
      reason: "note",
      note: "106.4 bore, thinner gasket for 10.5:1",
    });
    const again = await post(builder, id, {
      intent: "close-revision",
      note: "Again",
      expectedVersion: String(v),
    });
    expect(again.status).toBe(400);
    expect(again.body.result.error[""]).toEqual(["No revision is open: the next edit opens one."]);
    expect(await edit(builder, id, setRev("5700"))).toMatchObject({
      revision: 3,
      revisionEdits: 1,
    });
    expect((await listRevisions(db, id))[1]).toMatchObject({
      revision: 2,
      note: "106.4 bore, thinner gasket for 10.5:1",
      closeReason: "note",
    });
  });

  it("restores the state right after a single edit as a new edit, losing none in between", async () => {
    const id = await newPackage("Restore edit");
    await edit(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cyl) }); // e2
    await edit(builder, id, { intent: "set-part", slot: "flywheel", partId: String(part.fly) }); // e3
    await edit(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cylbig) }); // e4
    await edit(builder, id, setRev("6000")); // e5
    const e3 = await db
      .selectFrom("package_edits")
      .select("spec")
      .where("package_id", "=", id)
      .where("version", "=", 3)
      .executeTakeFirstOrThrow();
    const stale = await post(
      builder,
      id,
      { intent: "restore", target: "e3", expectedVersion: "4" },
      "overview",
    );
    expect(stale.status).toBe(409);
    expect(stale.body.message).toMatch(/saved edit 5/);
    expect(
      (
        await post(
          builder,
          id,
          { intent: "restore", target: "e99", expectedVersion: "5" },
          "overview",
        )
      ).status,
    ).toBe(404);
    const ok = await post(
      builder,
      id,
      { intent: "restore", target: "e3", expectedVersion: "5" },
      "overview",
    );
    expect(ok.status).toBe(200);
    expect(ok.body.message).toBe("The state after edit 3 restored as edit 6 (revision 2).");
    const row = await db
      .selectFrom("packages")
      .select(["spec", "version", "rev_limit_rpm"])
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ spec: e3.spec, version: 6, rev_limit_rpm: null });
    const log = await db
      .selectFrom("package_edits")
      .select(["version", "change"])
      .where("package_id", "=", id)
      .orderBy("version")
      .execute();
    expect(log.map((e) => e.version)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(log.at(-1)!.change).toBe("Restored edit 3 (revision 2)");
  });

  it("compares two revisions, and two single edits, field by field", async () => {
    const id = await newPackage("Compare");
    await edit(builder, id, { intent: "set-part", slot: "cylinder", partId: String(part.cyl) }); // e2 r2
    await edit(builder, id, { intent: "set-part", slot: "flywheel", partId: String(part.fly) }); // e3 r2
    await edit(owner, id, { intent: "set-part", slot: "cylinder", partId: String(part.cylbig) }); // e4 r3
    await edit(owner, id, setRev("6000")); // e5 r3
    const view = async (q: string) =>
      (await overviewLoader({
        request: await requestAs(writer, `/packages/${id}?${q}`),
        params: { id: String(id) },
        context: {},
      } as never)) as any;
    const revs = (await view("a=r2&b=r3")).compare;
    expect(revs.a).toMatchObject({
      kind: "revision",
      number: 2,
      label: "revision 2",
      recomputed: false,
    });
    expect(revs.specChanges).toEqual([
      {
        key: "cylinder.part",
        label: "Bore (cylinders)",
        before: `RV-${tag}-cyl Revision test cyl`,
        after: `RV-${tag}-cylbig Revision test cylbig`,
      },
      { key: "revLimitRpm", label: "Rev limit", before: "—", after: "6000 rpm" },
    ]);
    // 2 × π/4 × bore² × stroke (derived): 101.6 mm → 1853 cc, 104.8 mm → 1972 cc
    const byKey = Object.fromEntries(revs.resultChanges.map((r: any) => [r.key, r]));
    expect(byKey.displacementCc).toMatchObject({ before: "1853", after: "1972" });
    expect(byKey.meanPistonSpeedMs).toMatchObject({ before: "—", after: "22.9" });

    const edits = (await view("a=e2&b=e3")).compare;
    expect(edits.a).toMatchObject({
      kind: "edit",
      number: 2,
      label: "edit 2 (revision 2)",
      recomputed: true,
    });
    expect(edits.specChanges).toEqual([
      {
        key: "flywheel.part",
        label: "Stroke (flywheel / crank)",
        before: "empty",
        after: `RV-${tag}-fly Revision test fly`,
      },
    ]);
    expect(
      Object.fromEntries(edits.resultChanges.map((r: any) => [r.key, r.after])).displacementCc,
    ).toBe("1853");

    expect((await view("a=r2&b=e99")).compare).toBeNull();
    expect((await view("a=r2&b=e99")).compareAsked).toBe(true);
  });

  it("refuses a save on a stale version of the working copy, with what changed since", async () => {
    const id = await newPackage("Stale");
    const base = await versionOf(id);
    const first = await post(builder, id, {
      intent: "set-part",
      slot: "cylinder",
      partId: String(part.cyl),
      expectedRevision: String(base),
    });
    expect(first.status).toBe(200);
    const late = await post(builder, id, {
      ...setRev("6100"),
      expectedRevision: String(base),
    });
    expect(late.status).toBe(409);
    expect(late.body.stale).toMatchObject({
      currentVersion: base + 1,
      baseVersion: base,
      savedBy: builder.name,
      changes: [
        {
          key: "cylinder.part",
          label: "Bore (cylinders)",
          before: "empty",
          after: `RV-${tag}-cyl Revision test cyl`,
        },
      ],
    });
    expect(late.body.current).toMatchObject({ version: base + 1, revision: 2, revisionEdits: 1 });
    // of two saves on one base, one wins and the other writes nothing
    const [a, b] = await Promise.all([
      post(builder, id, { ...setRev("6200"), expectedRevision: String(base + 1) }),
      post(owner, id, { ...setRev("6300"), expectedRevision: String(base + 1) }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const counts = await db
      .selectFrom("package_edits")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("package_id", "=", id)
      .executeTakeFirstOrThrow();
    expect(Number(counts.n)).toBe(3);
    const revCount = await db
      .selectFrom("package_revisions")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("package_id", "=", id)
      .executeTakeFirstOrThrow();
    // the winner was the builder (revision 2 goes on) or the owner (revision 3 opened)
    expect(Number(revCount.n)).toBe(a.status === 200 ? 2 : 3);
  });
});

describe("the working-copy migration", () => {
  const name = `torquewright_mig_${tag}`;
  let mig: Kysely<any>;

  beforeAll(async () => {
    const admin = new pg.Client({ connectionString: withDatabase(testDatabaseUrl(), "postgres") });
    await admin.connect();
    await admin.query(`create database "${name}"`);
    await admin.end();
    mig = createDb(withDatabase(testDatabaseUrl(), name), 2) as Kysely<any>;
    for (const m of [core, catalog, auth, packagesMigration]) await m.up(mig);
    return async () => {
      await mig.destroy();
      const a = new pg.Client({ connectionString: withDatabase(testDatabaseUrl(), "postgres") });
      await a.connect();
      await a.query(`drop database if exists "${name}" with (force)`);
      await a.end();
    };
  });

  it("keeps each old revision as it was: closed, holding its one save as its only edit", async () => {
    const user = await mig
      .insertInto("users")
      .values({ email: "old@staff.test", name: "Old builder", role: "builder" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const customer = await mig
      .insertInto("customers")
      .values({ name: "Old customer", notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const bike = await mig
      .insertInto("bikes")
      .values({ customer_id: customer.id, year: 2015, model: "Old twin", notes: "" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const spec = (rpm: number | null) => JSON.stringify({ ...emptySpec(), revLimitRpm: rpm });
    const pkg = await mig
      .insertInto("packages")
      .values({
        name: "Old package",
        bike_id: bike.id,
        builder_id: user.id,
        current_revision: 3,
        spec: spec(5800),
        results: "{}",
        rule_snapshot: "{}",
        findings: "[]",
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const saves = [
      ["Package started", null, "2026-11-01T10:00:00Z"],
      ["Rev limit: 5600", 5600, "2026-11-01T10:05:00Z"],
      ["Rev limit: 5800", 5800, "2026-11-01T10:06:00Z"],
    ] as const;
    for (const [i, [change, rpm, at]] of saves.entries())
      await mig
        .insertInto("package_revisions")
        .values({
          package_id: pkg.id,
          revision: i + 1,
          spec: spec(rpm),
          results: "{}",
          rule_snapshot: "{}",
          findings: JSON.stringify(
            i === 2 ? [{ ruleId: 1, ruleVersion: 1, kind: "conflict" }] : [],
          ),
          change,
          saved_by: user.id,
          saved_at: at,
        })
        .execute();

    await workingCopy.up(mig);

    const revs = await mig
      .selectFrom("package_revisions")
      .select([
        "revision",
        "change",
        "close_reason",
        "closed_at",
        "opened_at",
        "note",
        "spec",
        "findings",
      ])
      .where("package_id", "=", pkg.id)
      .orderBy("revision")
      .execute();
    expect(revs.map((r) => [r.revision, r.change, r.close_reason, r.note])).toEqual([
      [1, "Package started", "saved", null],
      [2, "Rev limit: 5600", "saved", null],
      [3, "Rev limit: 5800", "saved", null],
    ]);
    expect(revs.map((r) => r.closed_at)).toEqual(saves.map(([, , at]) => new Date(at)));
    expect(revs.map((r) => r.opened_at)).toEqual(saves.map(([, , at]) => new Date(at)));
    expect(revs[2]!.findings).toEqual([{ ruleId: 1, ruleVersion: 1, kind: "conflict" }]);
    const edits = await mig
      .selectFrom("package_edits")
      .select(["version", "revision", "user_id", "change", "at", "spec", "intent"])
      .where("package_id", "=", pkg.id)
      .orderBy("version")
      .execute();
    expect(edits).toEqual(
      saves.map(([change, rpm, at], i) => ({
        version: i + 1,
        revision: i + 1,
        user_id: user.id,
        change,
        at: new Date(at),
        spec: JSON.parse(spec(rpm)),
        intent: null,
      })),
    );
    const row = await mig
      .selectFrom("packages")
      .select(["version", "current_revision"])
      .where("id", "=", pkg.id)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ version: 3, current_revision: 3 });
    const shop = await sql<{ d: string }>`
      select column_default as d from information_schema.columns
       where table_name = 'shop' and column_name = 'revision_quiet_minutes'`.execute(mig);
    expect(shop.rows[0]!.d).toBe("60");

    // the next edit on the migrated package, on the schema as it is now, opens revision 4
    // on version 3
    const later = Object.keys(migrations)
      .sort()
      .filter((f) => f > WORKING_COPY_FILE);
    expect(Object.keys(migrations)).toContain(WORKING_COPY_FILE);
    for (const f of later) await (await migrations[f]!()).up(mig);
    const next = await saveEdit(mig as never, {
      packageId: pkg.id,
      expectedVersion: 3,
      spec: { ...emptySpec(), revLimitRpm: 6000 },
      change: "Rev limit: 6000",
      userId: user.id,
    });
    expect(next).toMatchObject({
      ok: true,
      version: 4,
      revision: 4,
      how: "none",
      revisionEdits: 1,
    });
  });
});
