// An app server killed with SIGKILL in the middle of a burst of bench saves: each save is
// one statement (the package row and its revision row together), so whatever was in
// flight either landed whole or not at all. Afterwards every package's current revision
// is its last revision row, and an edit based on an older revision gets the stale answer
// (with what changed) instead of overwriting anything.
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createDb } from "../../db/connect";
import type { Database } from "../../db/schema";
import { createSession } from "~/lib/auth/session.server";
import { createPackage } from "~/lib/packages/store.server";
import { decodeData, freshDatabase, startApp, type App, type Cluster } from "./support";

const PACKAGES = 6;
const KILL_AFTER_SAVES = 18;

let cluster: Cluster;
let db: Kysely<Database>;
let app: App;
let cookie = "";
const packages: number[] = [];
let cylinders: number[] = [];

beforeAll(async () => {
  cluster = await freshDatabase(inject("faultCluster"), "torquewright_faults_kill");
  db = createDb(cluster.url, 2);
  const builder = await db
    .selectFrom("users")
    .select(["id"])
    .where("role", "=", "builder")
    .where("disabled_at", "is", null)
    .orderBy("id")
    .executeTakeFirstOrThrow();
  const demo = await db
    .selectFrom("packages")
    .select(["spec", "bike_id"])
    .where("is_template", "=", false)
    .where("status", "=", "draft")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  cylinders = (
    await db
      .selectFrom("parts")
      .select("id")
      .where("category", "=", "cylinders")
      .where("archived_at", "is", null)
      .orderBy("id")
      .limit(2)
      .execute()
  ).map((r) => r.id);
  for (let i = 0; i < PACKAGES; i++)
    packages.push(
      await createPackage(
        db,
        {
          name: `Burst package ${i + 1}`,
          bikeId: demo.bike_id,
          isTemplate: false,
          builderId: builder.id,
          spec: demo.spec,
        },
        builder.id,
      ),
    );
  cookie = (await createSession(db, builder.id)).split(";")[0]!;
  app = await startApp(cluster.url, { JOBS_WORKER: "0" });
});

afterAll(async () => {
  await app?.kill("SIGTERM");
  await db?.destroy();
  await cluster?.drop();
});

async function benchSave(
  base: string,
  packageId: number,
  expectedRevision: number,
  partId: number,
) {
  const res = await fetch(`${base}/packages/${packageId}/bench.data`, {
    method: "POST",
    headers: { Cookie: cookie, Origin: base, "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({
      intent: "set-part",
      slot: "cylinder",
      partId: String(partId),
      expectedRevision: String(expectedRevision),
    }),
  });
  return { status: res.status, body: (await decodeData(res)) as { data?: any } };
}

describe("an app server killed during a burst of bench saves", () => {
  it("leaves every package whole, and a stale edit gets the stale answer", async () => {
    expect(cylinders).toHaveLength(2);
    const known = new Map(packages.map((id) => [id, 1]));
    let answered = 0;
    let killed = false;
    // one chain of saves per package, all at once; each save names the revision the
    // previous answer brought, so every answered save is a real one
    const chains = packages.map(async (id) => {
      for (;;) {
        const rev = known.get(id)!;
        let out;
        try {
          out = await benchSave(app.url, id, rev, cylinders[rev % 2]!);
        } catch {
          return; // the server is gone
        }
        expect(out.status).toBe(200);
        known.set(id, rev + 1);
        if (++answered >= KILL_AFTER_SAVES && !killed) {
          killed = true;
          await app.kill("SIGKILL");
        }
      }
    });
    await Promise.all(chains);
    expect(killed).toBe(true);
    expect(app.process.signalCode).toBe("SIGKILL");

    const rows = await db
      .selectFrom("packages")
      .select(["id", "current_revision", "spec", "results", "findings"])
      .where("id", "in", packages)
      .orderBy("id")
      .execute();
    for (const row of rows) {
      const revisions = await db
        .selectFrom("package_revisions")
        .select(["revision", "spec", "results", "findings"])
        .where("package_id", "=", row.id)
        .orderBy("revision")
        .execute();
      // one revision row per save, numbered 1…n, and the package is its last one
      expect(revisions.map((r) => r.revision)).toEqual(
        Array.from({ length: row.current_revision }, (_, i) => i + 1),
      );
      const last = revisions.at(-1)!;
      expect(row.spec).toEqual(last.spec);
      expect(row.results).toEqual(last.results);
      expect(row.findings).toEqual(last.findings);
      // an answer lost with the server is at most the one save in flight
      const seen = known.get(row.id)!;
      expect(row.current_revision - seen).toBeGreaterThanOrEqual(0);
      expect(row.current_revision - seen).toBeLessThanOrEqual(1);
    }

    app = await startApp(cluster.url, { JOBS_WORKER: "0" });
    for (const row of rows) {
      expect(row.current_revision).toBeGreaterThanOrEqual(2);
      const old = row.current_revision - 1;
      const stale = await benchSave(app.url, row.id, old, cylinders[old % 2]!);
      expect(stale.status).toBe(409);
      expect(stale.body.data?.ok).toBe(false);
      expect(stale.body.data?.stale).toMatchObject({
        stale: true,
        baseRevision: old,
        currentRevision: row.current_revision,
      });
      expect(stale.body.data?.current?.revision).toBe(row.current_revision);
      // nothing was written by the refused edit; the edit on top of the current one saves
      const ok = await benchSave(
        app.url,
        row.id,
        row.current_revision,
        cylinders[row.current_revision % 2]!,
      );
      expect(ok.status).toBe(200);
    }
    const after = await db
      .selectFrom("packages")
      .select(["id", "current_revision"])
      .where("id", "in", packages)
      .orderBy("id")
      .execute();
    expect(after.map((r) => r.current_revision)).toEqual(rows.map((r) => r.current_revision + 1));
    expect(app.exited()).toBe(false);
  });
});
