import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { createInterface } from "node:readline";
import { beforeAll, describe, expect, it } from "vitest";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { getDb } from "~/lib/db.server";
import {
  getRuleHistory,
  listPackageSnapshots,
  loadActiveRules,
  previewRule,
} from "~/lib/fit-rules/rules.server";
import { buildRuleSnapshot } from "~/lib/fit-rules/snapshot";
import { action as newAction, loader as newLoader } from "~/routes/rules.new";
import { action as editAction, loader as ruleLoader } from "~/routes/rules.$id";
import { loader as listLoader } from "~/routes/rules";
import { args, post, run } from "../support/route";
import { createTestUser, requestAs, type TestUser } from "../support/auth";

const db = getDb();
const tag = () => randomBytes(4).toString("hex");
const users = {} as Record<"owner" | "builder" | "service_writer" | "apprentice", TestUser>;

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  for (const r of ["owner", "builder", "service_writer", "apprentice"] as const)
    users[r] = await createTestUser(db, r);
});

function ruleBody(over: Record<string, string> = {}) {
  return {
    intent: "save",
    name: `Axle check ${tag()}`,
    kind: "upgrade",
    condition: 'power_hp > 145 and has("stock-axle-adjusters")',
    message: "Fit locking adjusters.",
    upgrade_category: "axle_adjusters",
    active: "on",
    ...over,
  };
}

describe("writing fit rules", () => {
  it("the owner saves a rule: version 1 and its history row", async () => {
    const body = ruleBody();
    const r = await run(async () => newAction(args(await post(users.owner, "/rules/new", body))));
    expect(r.status).toBe(302);
    const id = Number(r.location!.match(/\/rules\/(\d+)/)![1]);
    const history = await getRuleHistory(db, id);
    expect(history).toHaveLength(1);
    expect(history[0]).toMatchObject({
      version: 1,
      condition: body.condition,
      name: body.name,
      changed_by: users.owner.id,
      change_note: "Created",
    });
  });

  it("refuses a forbidden condition beside the field and keeps the other values", async () => {
    const r = await run(async () =>
      newAction(
        args(await post(users.owner, "/rules/new", ruleBody({ condition: 'import("fs") == 1' }))),
      ),
    );
    expect(r.status).toBe(400);
    expect(r.value.result.error.condition[0]).toMatch(
      /"import" is not a function fit rules can use.*character 1/,
    );
    expect(r.value.result.initialValue.message).toBe("Fit locking adjusters.");
  });

  it("an upgrade rule needs its category; the schema says so beside the field", async () => {
    const r = await run(async () =>
      newAction(args(await post(users.owner, "/rules/new", ruleBody({ upgrade_category: "" })))),
    );
    expect(r.status).toBe(400);
    expect(r.value.result.error.upgrade_category[0]).toMatch(/names the category/);
  });

  it("preview returns the lists and saves nothing", async () => {
    const name = `Preview only ${tag()}`;
    const r = await run(async () =>
      newAction(args(await post(users.owner, "/rules/new", ruleBody({ intent: "preview", name })))),
    );
    expect(r.status).toBe(200);
    expect(r.value.preview.ok).toBe(true);
    expect(await db.selectFrom("fit_rules").where("name", "=", name).selectAll().execute()).toEqual(
      [],
    );
  });

  it("the pair form writes has(A) and has(B) as a conflict", async () => {
    const r = await run(async () =>
      newAction(
        args(
          await post(users.owner, "/rules/new", {
            intent: "pair-save",
            name: `Pair ${tag()}`,
            a: "gear-drive-cam",
            b: "TW-CAM-PLT-STD",
            message: "Not together.",
          }),
        ),
      ),
    );
    expect(r.status).toBe(302);
    const id = Number(r.location!.match(/\/rules\/(\d+)/)![1]);
    const rule = await db
      .selectFrom("fit_rules")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirstOrThrow();
    expect(rule).toMatchObject({
      kind: "conflict",
      condition: 'has("gear-drive-cam") and has("tw-cam-plt-std")',
    });
  });

  it("an edit writes version 2 with its note; a stale edit is refused", async () => {
    const made = await run(async () =>
      newAction(args(await post(users.owner, "/rules/new", ruleBody()))),
    );
    const id = made.location!.match(/\/rules\/(\d+)/)![1]!;
    const edit = await run(async () =>
      editAction(
        args(
          await post(
            users.owner,
            `/rules/${id}`,
            ruleBody({
              condition: 'power_hp > 150 and has("stock-axle-adjusters")',
              version: "1",
              change_note: "Raised to 150",
            }),
          ),
          { id },
        ),
      ),
    );
    expect(edit.status).toBe(302);
    const stale = await run(async () =>
      editAction(args(await post(users.owner, `/rules/${id}`, ruleBody({ version: "1" })), { id })),
    );
    expect(stale.status).toBe(409);
    const history = await getRuleHistory(db, Number(id));
    expect(history.map((h) => [h.version, h.change_note])).toEqual([
      [2, "Raised to 150"],
      [1, "Created"],
    ]);
    const page = await run(async () =>
      ruleLoader(args(await requestAs(users.apprentice, `/rules/${id}`), { id })),
    );
    expect(page.value.history).toHaveLength(2);
    expect(page.value.canEdit).toBe(false);
    expect(page.value.options).toBeNull();
  });

  it.each(["builder", "service_writer", "apprentice"] as const)(
    "%s may read the rules but gets 403 on every change",
    async (role) => {
      const list = await run(async () => listLoader(args(await requestAs(users[role], "/rules"))));
      expect(list.status).toBe(200);
      expect(
        (await run(async () => newLoader(args(await requestAs(users[role], "/rules/new"))))).status,
      ).toBe(403);
      expect(
        (await run(async () => newAction(args(await post(users[role], "/rules/new", ruleBody())))))
          .status,
      ).toBe(403);
      const some = await db
        .selectFrom("fit_rules")
        .select(["id", "version", "condition"])
        .orderBy("id")
        .executeTakeFirstOrThrow();
      expect(
        (
          await run(async () =>
            editAction(
              args(await post(users[role], `/rules/${some.id}`, ruleBody()), {
                id: String(some.id),
              }),
            ),
          )
        ).status,
      ).toBe(403);
      // the rule posted to is as it was
      expect(
        await db
          .selectFrom("fit_rules")
          .select(["id", "version", "condition"])
          .where("id", "=", some.id)
          .executeTakeFirstOrThrow(),
      ).toEqual(some);
      expect(
        await db
          .selectFrom("fit_rule_versions")
          .where("changed_by", "=", users[role].id)
          .selectAll()
          .execute(),
      ).toEqual([]);
    },
  );
});

describe("loading and previewing", () => {
  // saves through the real actions: a new rule, then edits of it (name, active)
  async function addRule(name: string): Promise<number> {
    const r = await run(async () =>
      newAction(args(await post(users.owner, "/rules/new", ruleBody({ name })))),
    );
    expect(r.status).toBe(302);
    return Number(r.location!.match(/\/rules\/(\d+)/)![1]);
  }
  async function editRule(id: number, version: number, over: Record<string, string>) {
    const body: Record<string, string> = { ...ruleBody(over), version: String(version) };
    if (over.active === "") delete body.active; // an unticked box is not sent
    const r = await run(async () =>
      editAction(args(await post(users.owner, `/rules/${id}`, body), { id: String(id) })),
    );
    expect(r.status).toBe(302);
  }
  const mine = (rules: { id: number; version: number; name: string }[], id: number) =>
    rules.filter((r) => r.id === id).map((r) => ({ id: r.id, version: r.version, name: r.name }));

  it("loadActiveRules sees an added, edited and deactivated rule at once", async () => {
    await loadActiveRules(db); // the cache is warm
    const name = `Cache ${tag()}`;
    const id = await addRule(name);
    expect(mine(await loadActiveRules(db), id)).toEqual([{ id, version: 1, name }]);
    await editRule(id, 1, { name: `${name} edited` });
    expect(mine(await loadActiveRules(db), id)).toEqual([
      { id, version: 2, name: `${name} edited` },
    ]);
    await editRule(id, 2, { name: `${name} edited`, active: "" });
    expect(mine(await loadActiveRules(db), id)).toEqual([]);
  });

  it("another app server's rule cache sees the same changes at once", async () => {
    const child = spawn("npx", ["tsx", "tests/support/rules-reader.ts"], {
      env: process.env,
      stdio: ["pipe", "pipe", "inherit"],
    });
    const replies = createInterface({ input: child.stdout! })[Symbol.asyncIterator]();
    const ask = async (): Promise<{ id: number; version: number; name: string }[]> => {
      child.stdin!.write("read\n");
      const line = await replies.next();
      if (line.done) throw new Error("the second server stopped");
      return JSON.parse(line.value);
    };
    try {
      await ask(); // its cache is warm, before any of the changes below
      const name = `Two servers ${tag()}`;
      const id = await addRule(name);
      expect(mine(await ask(), id)).toEqual([{ id, version: 1, name }]);
      await editRule(id, 1, { name: `${name} edited`, condition: "power_hp > 150" });
      expect(mine(await ask(), id)).toEqual([{ id, version: 2, name: `${name} edited` }]);
      await editRule(id, 2, { name: `${name} edited`, active: "" });
      expect(mine(await ask(), id)).toEqual([]);
      await editRule(id, 3, { name: `${name} back`, active: "on" });
      expect(mine(await ask(), id)).toEqual([{ id, version: 4, name: `${name} back` }]);
    } finally {
      child.stdin!.end();
      await new Promise((resolve) => child.once("exit", resolve));
    }
  });

  it("previewRule takes its packages from an injected loader", async () => {
    const packages = [
      {
        packageId: 1,
        name: "Touring 107",
        snapshot: buildRuleSnapshot({
          numbers: { power_hp: 150 },
          parts: [
            {
              slot: "axle_adjusters",
              partId: null,
              partNumber: "TW-AX-STD",
              category: "axle_adjusters",
              tags: ["stock-axle-adjusters"],
              attributes: {},
              stock: true,
            },
          ],
        }),
      },
      {
        packageId: 2,
        name: "Mild 114",
        snapshot: buildRuleSnapshot({ numbers: { power_hp: 120 }, parts: [] }),
      },
    ];
    const r = await previewRule(
      db,
      {
        name: "x",
        kind: "upgrade",
        condition: 'power_hp > 145 and has("stock-axle-adjusters")',
        message: "m",
        upgrade_category: "axle_adjusters",
        suggested_part_id: null,
        active: true,
      },
      null,
      {
        listPackageSnapshots: async () => packages,
      },
    );
    expect(r.ok && r.willFlag.map((p) => p.name)).toEqual(["Touring 107"]);
    expect(r.ok && r.checked).toBe(2);
  });

  it("listPackageSnapshots reads the bench's stored snapshots", async () => {
    const snapshot = buildRuleSnapshot({ numbers: { power_hp: 151 }, parts: [] });
    const name = `Snapshot pkg ${tag()}`;
    await db
      .insertInto("packages")
      .values({
        name,
        is_template: true,
        spec: "{}",
        results: "{}",
        rule_snapshot: JSON.stringify(snapshot),
      })
      .execute();
    const rows = await listPackageSnapshots(db);
    expect(rows.find((r) => r.name === name)?.snapshot).toEqual(snapshot);
  });
});
