import { describe, expect, it } from "vitest";
import { loader } from "~/routes/healthz";
import { getDb } from "~/lib/db.server";

describe("GET /healthz", () => {
  it("answers ok after one query against the test database", async () => {
    const res = (await loader({
      request: new Request("http://t/healthz"),
      params: {},
      context: {},
    } as never)) as Response;
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true });
    const { rows } = await (
      await import("kysely")
    ).sql<{ db: string }>`select current_database() as db`.execute(getDb());
    expect(rows[0]?.db).toBe("torquewright_test");
  });

  it("answers 503 with the reason when the database cannot be reached", async () => {
    const { createDb } = await import("../../db/connect");
    const g = globalThis as unknown as { __twDb?: unknown };
    const saved = g.__twDb;
    g.__twDb = createDb("postgres://postgres@127.0.0.1:1/none", 1);
    try {
      const res = (await loader({
        request: new Request("http://t/healthz"),
        params: {},
        context: {},
      } as never)) as Response;
      expect(res.status).toBe(503);
      const body = await res.json();
      expect(body.ok).toBe(false);
      expect(body.reason).toMatch(/database unreachable/);
    } finally {
      g.__twDb = saved;
    }
  });
});
