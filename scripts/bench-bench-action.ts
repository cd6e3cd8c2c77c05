// One spec-bench action under load: the built server (its own process) answers POSTs to
// the bench route's action — parse, recompute with calc/, evaluate 500 active fit rules,
// save a revision — from this process's autocannon on loopback, at 10 and 50
// connections, beside /healthz of the same server as the floor. Also prints the bench
// route's browser JavaScript, gzipped. Prints figures; asserts nothing.
//
// It works in a throwaway database (torquewright_bench, reset and seeded here, dropped
// at the end) and stops the server it started. BENCH_SECONDS sets each run's length.
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, readFileSync, statSync } from "node:fs";
import { createServer } from "node:net";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";
import autocannon, { type Request as LoadRequest } from "autocannon";
import pg from "pg";
import { generatedCondition } from "./lib/generated-rules";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = [10, 50];
const RULES = 500;
const DB_NAME = "torquewright_bench";

const sh = (cmd: string, args: string[]) =>
  execFileSync(cmd, args, {
    cwd: ROOT,
    encoding: "utf8",
    stdio: ["ignore", "pipe", "inherit"],
  }).trim();

// ---- the database: reset, seed, 500 active rules, one package per connection ----
let startedPg = false;
if (!process.env.DATABASE_URL) {
  try {
    sh("bash", ["scripts/pg.sh", "status"]);
  } catch {
    startedPg = true;
  }
  sh("bash", ["scripts/pg.sh", "start"]);
}
const base = new URL(process.env.DATABASE_URL ?? sh("bash", ["scripts/pg.sh", "url"]));
base.pathname = `/${DB_NAME}`;
const DATABASE_URL = base.toString();
const SESSION_SECRET = randomBytes(32).toString("hex");
Object.assign(process.env, {
  DATABASE_URL,
  SESSION_SECRET,
  NODE_ENV: "production",
  JOBS_WORKER: "0",
});

const { resetDatabase } = await import("../db/reset");
const { seed } = await import("../db/seed");
const { getDb } = await import("../app/lib/db.server");
const { createRule } = await import("../app/lib/fit-rules/rules.server");
const { createPackage } = await import("../app/lib/packages/store.server");
const { createSession } = await import("../app/lib/auth/session.server");

await resetDatabase(DATABASE_URL);
const db = getDb();
await seed(db);

const active = async () =>
  Number(
    (
      await db
        .selectFrom("fit_rules")
        .select((eb) => eb.fn.countAll<string>().as("n"))
        .where("active", "=", true)
        .executeTakeFirstOrThrow()
    ).n,
  );
for (let i = await active(); i < RULES; i++) {
  const kind = (["conflict", "upgrade", "caution"] as const)[i % 3]!;
  const out = await createRule(
    db,
    {
      name: `Load rule ${i + 1}`,
      kind,
      condition: generatedCondition(i),
      message: "Generated for the load benchmark.",
      upgrade_category: kind === "upgrade" ? "axle_adjusters" : null,
      suggested_part_id: null,
      active: true,
    },
    null,
  );
  if (!out.ok) throw new Error(`rule ${i + 1} did not compile: ${JSON.stringify(out.check)}`);
}
const ruleCount = await active();

const builder = await db
  .selectFrom("users")
  .select(["id", "name"])
  .where("role", "=", "builder")
  .orderBy("id")
  .executeTakeFirstOrThrow();
const demo = await db
  .selectFrom("packages")
  .select(["spec", "bike_id"])
  .where("is_template", "=", false)
  .where("status", "=", "draft")
  .orderBy("id")
  .executeTakeFirstOrThrow();
const cylinders = (
  await db
    .selectFrom("parts")
    .select("id")
    .where("category", "=", "cylinders")
    .where("archived_at", "is", null)
    .orderBy("id")
    .limit(2)
    .execute()
).map((r) => r.id);
if (cylinders.length < 2) throw new Error("the demo catalog has fewer than two cylinder parts");
// No two requests in flight edit the same package, so every request is a real save, never a stale one.
const packages: number[] = [];
for (let i = 0; i < Math.max(...CONNECTIONS) + 10; i++) {
  packages.push(
    await createPackage(
      db,
      {
        name: `Load package ${i + 1}`,
        bikeId: demo.bike_id,
        isTemplate: false,
        builderId: builder.id,
        spec: demo.spec,
      },
      builder.id,
    ),
  );
}
const cookie = (await createSession(db, builder.id)).split(";")[0]!;

// ---- the built server, in its own process ----
const serverEntry = path.join(ROOT, "build/server/index.js");
// figures always describe the code as it is: build first (BENCH_SKIP_BUILD=1 reuses build/)
if (process.env.BENCH_SKIP_BUILD !== "1" || !existsSync(serverEntry))
  sh("npx", ["react-router", "build"]);
const port = await new Promise<number>((resolve, reject) => {
  const s = createServer();
  s.once("error", reject);
  s.listen(0, "127.0.0.1", () => {
    const p = (s.address() as { port: number }).port;
    s.close(() => resolve(p));
  });
});
const APP_URL = `http://127.0.0.1:${port}`;
// The production server (scripts/serve.mjs) without its access log; BENCH_NODE_ARGS passes
// extra Node flags (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof") for profiling.
const nodeArgs = (process.env.BENCH_NODE_ARGS ?? "").split(" ").filter(Boolean);
const server: ChildProcess = spawn(
  process.execPath,
  [...nodeArgs, path.join(ROOT, "scripts/serve.mjs"), serverEntry],
  {
    cwd: ROOT,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: "127.0.0.1",
      NODE_ENV: "production",
      APP_URL,
      DATABASE_URL,
      SESSION_SECRET,
      JOBS_WORKER: "0",
      TW_ACCESS_LOG: "0",
    },
    stdio: ["ignore", "ignore", "inherit"],
  },
);
let serverExited = false;
server.once("exit", () => (serverExited = true));

async function stopAll() {
  if (!serverExited) {
    server.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 100));
    for (let i = 0; i < 50 && !serverExited; i++) await new Promise((r) => setTimeout(r, 100));
    if (!serverExited) server.kill("SIGKILL");
  }
  await db.destroy();
  const admin = new URL(DATABASE_URL);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  await client.query(`drop database if exists "${DB_NAME}" with (force)`);
  await client.end();
  if (startedPg) sh("bash", ["scripts/pg.sh", "stop"]);
}

try {
  for (let i = 0; ; i++) {
    if (serverExited) throw new Error("the server stopped before answering");
    try {
      if ((await fetch(`${APP_URL}/healthz`)).ok) break;
    } catch {
      // not listening yet
    }
    if (i > 150) throw new Error("the server did not answer /healthz within 30 s");
    await new Promise((r) => setTimeout(r, 200));
  }

  // ---- the load ----
  const revisions = new Map<number, number>(packages.map((id) => [id, 1]));
  type Figures = {
    median: number;
    p95: number;
    rps: number;
    total: number;
    non2xx: number;
    errors: number;
  };

  function stats(samples: number[], seconds: number, non2xx: number, errors: number): Figures {
    const s = [...samples].sort((a, b) => a - b);
    const at = (q: number) => s[Math.min(s.length - 1, Math.floor(q * s.length))] ?? NaN;
    return {
      median: at(0.5),
      p95: at(0.95),
      rps: s.length / seconds,
      total: s.length,
      non2xx,
      errors,
    };
  }

  async function run(
    connections: number,
    seconds: number,
    kind: "healthz" | "action",
  ): Promise<Figures> {
    // a run ends with answers in flight; their saves landed, so read every revision back first
    for (const r of await db
      .selectFrom("packages")
      .select(["id", "current_revision"])
      .where("id", "in", packages)
      .execute())
      revisions.set(r.id, r.current_revision);
    const free = [...packages];
    let refusals = 0;
    const samples: number[] = [];
    const requests: LoadRequest[] =
      kind === "healthz"
        ? [{ method: "GET" as const, path: "/healthz" }]
        : [
            {
              method: "POST" as const,
              path: "/",
              headers: {
                Cookie: cookie,
                Origin: APP_URL,
                "Content-Type": "application/x-www-form-urlencoded",
              },
              // a request leases a package no other request is editing and names the revision
              // its last answer brought; the answer hands the package back
              setupRequest: (req, context) => {
                context.pkg = free.pop() ?? packages[0];
                context.rev = revisions.get(context.pkg)!;
                const partId = cylinders[context.rev % 2]!;
                req.path = `/packages/${context.pkg}/bench.data`;
                req.body = new URLSearchParams({
                  intent: "set-part",
                  slot: "cylinder",
                  partId: String(partId),
                  expectedRevision: String(context.rev),
                }).toString();
                return req;
              },
              onResponse: (status, body, context) => {
                const pkg = context.pkg as number;
                if (status === 200) {
                  revisions.set(pkg, context.rev + 1);
                  free.push(pkg);
                  return;
                }
                if (refusals++ < 3) console.log(`  (a ${status} answer: ${body.slice(0, 160)})`);
                // read the revision back before the package is used again
                void db
                  .selectFrom("packages")
                  .select("current_revision")
                  .where("id", "=", pkg)
                  .executeTakeFirstOrThrow()
                  .then((r) => {
                    revisions.set(pkg, r.current_revision);
                    free.push(pkg);
                  });
              },
            },
          ];
    const instance = autocannon({
      url: APP_URL,
      connections,
      duration: seconds,
      pipelining: 1,
      requests,
    });
    instance.on("response", (_client: unknown, _status: number, _bytes: number, ms: number) =>
      samples.push(ms),
    );
    const result = await instance;
    return stats(samples, result.duration || seconds, result.non2xx, result.errors);
  }

  const revsBefore = Number(
    (
      await db
        .selectFrom("package_revisions")
        .select((eb) => eb.fn.countAll<string>().as("n"))
        .executeTakeFirstOrThrow()
    ).n,
  );
  await run(10, 2, "action"); // warm: JIT, the rule cache, the pool's connections
  await run(10, 1, "healthz");

  const rows: { what: string; c: number; f: Figures }[] = [];
  for (const c of CONNECTIONS) {
    rows.push({ what: "/healthz (floor)", c, f: await run(c, SECONDS, "healthz") });
    rows.push({ what: "bench action", c, f: await run(c, SECONDS, "action") });
  }
  const revsAfter = Number(
    (
      await db
        .selectFrom("package_revisions")
        .select((eb) => eb.fn.countAll<string>().as("n"))
        .executeTakeFirstOrThrow()
    ).n,
  );
  // what one request's rules found: the last revision of the package edited most
  const sample = await db
    .selectFrom("package_revisions")
    .select(["findings", "change"])
    .where("package_id", "in", packages)
    .orderBy("revision", "desc")
    .executeTakeFirstOrThrow();
  const fired = sample.findings as { kind: string; error?: string }[];
  const byKind = ["conflict", "upgrade", "caution"]
    .map((k) => `${fired.filter((f) => f.kind === k && !f.error).length} ${k}`)
    .join(", ");

  const ms = (v: number) => `${v.toFixed(1)} ms`.padStart(9);
  console.log(
    `bench action under load: ${SECONDS} s per run, loopback, autocannon in this process, the server in its own (NODE_ENV=production), ${ruleCount} active fit rules`,
  );
  console.log(
    "  one request = POST /packages/:id/bench.data (the bench's own fetcher post) with intent=set-part, the cylinder swapped",
  );
  console.log(
    "  between two parts, naming the package's current revision: parse, load the package row, load its parts, load the",
  );
  console.log(
    "  active rules (cached by a fingerprint query), recompute with calc/, evaluate every rule, save the next revision",
  );
  console.log(
    "  (conditional update + revision insert, one transaction), answer the bench state. No two requests in flight edit",
  );
  console.log(
    "  the same package, so none is refused as stale. The browser's follow-up reload of the page shell is not included.",
  );
  console.log("  what                 conn   median      p95      req/s   requests  non-2xx");
  for (const r of rows) {
    console.log(
      `  ${r.what.padEnd(20)} ${String(r.c).padStart(4)} ${ms(r.f.median)} ${ms(r.f.p95)} ${r.f.rps.toFixed(0).padStart(10)} ${String(r.f.total).padStart(10)} ${String(r.f.non2xx + r.f.errors).padStart(8)}`,
    );
  }
  const at10 = rows.find((r) => r.what === "bench action" && r.c === 10)!.f;
  console.log(
    `  target: action p95 < 50 ms at 10 connections → ${at10.p95.toFixed(1)} ms (${at10.p95 < 50 ? "met" : "missed"})`,
  );
  console.log(
    `  revisions saved during the runs (incl. warm-up): ${revsAfter - revsBefore}; rules that fire per request: ${fired.length} of ${ruleCount} findings (${byKind}, ${fired.filter((f) => f.error).length} not checkable), last change "${sample.change}"`,
  );

  // ---- the bench route's browser JavaScript, as the build emits it ----
  const build = (await import(pathToFileURL(serverEntry).href)) as {
    assets: {
      entry: { module: string; imports: string[] };
      routes: Record<string, { module: string; imports?: string[] }>;
    };
  };
  const gz = (url: string) => gzipSync(readFileSync(path.join(ROOT, "build/client", url))).length;
  const route = build.assets.routes["routes/packages.$id.bench"];
  if (!route) throw new Error("the build has no bench route");
  const own = [...new Set([route.module, ...(route.imports ?? [])])];
  const root = build.assets.routes.root!;
  const all = [
    ...new Set([
      build.assets.entry.module,
      ...build.assets.entry.imports,
      root.module,
      ...(root.imports ?? []),
      ...own,
    ]),
  ];
  const kB = (files: string[]) => `${(files.reduce((n, f) => n + gz(f), 0) / 1024).toFixed(1)} kB`;
  const built = new Date(statSync(serverEntry).mtime).toISOString();
  console.log(
    `bench route JavaScript, gzipped (build of ${built}): route chunk + its static imports ${kB(own)} in ${own.length} files (target < 200 kB);`,
  );
  console.log(
    `  with the client entry and the root route, a cold first load of the bench: ${kB(all)} in ${all.length} files`,
  );
} finally {
  await stopAll();
}
