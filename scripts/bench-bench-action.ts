// One spec-bench action under load: the built server (its own process) answers POSTs to
// the bench route's action — check the session, parse, recompute with calc/, evaluate 500
// active fit rules, save the edit into the working copy and its edit log — from this
// process's autocannon on loopback, at 10 and 50 connections, beside /healthz of the same
// server as the floor; then the same runs with 2 app worker processes (WEB_CONCURRENCY=2).
// Also prints the edit-log rows written per second and the bench route's browser
// JavaScript, gzipped. Prints figures; asserts nothing.
//
// It works in a throwaway database (torquewright_bench, reset and seeded here, dropped
// at the end) and stops the servers it started. BENCH_SECONDS sets each run's length;
// BENCH_PROFILE=dir profiles the one-process server (node --cpu-prof) and prints the top
// frames of the action runs.
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { createServer } from "node:net";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";
import autocannon, { type Request as LoadRequest } from "autocannon";
import { sql } from "kysely";
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
const freePort = () =>
  new Promise<number>((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const p = (s.address() as { port: number }).port;
      s.close(() => resolve(p));
    });
  });
// BENCH_PROFILE=dir runs the one-process server under `node --cpu-prof` (profile files in
// dir) and prints where its CPU time went while the bench action was under load.
const PROFILE_DIR = process.env.BENCH_PROFILE ? path.resolve(process.env.BENCH_PROFILE) : null;

type Server = { url: string; pid: number; stop: () => Promise<void> };

/**
 * CPU time (ms, user + system) used so far by a process and all its descendants, from
 * /proc: what a request costs whatever else the machine runs.
 */
function cpuMs(rootPid: number): number {
  const stats = new Map<number, { ppid: number; ticks: number }>();
  for (const d of readdirSync("/proc")) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const st = readFileSync(`/proc/${d}/stat`, "utf8");
      const f = st.slice(st.lastIndexOf(")") + 2).split(" ");
      // after the name: state ppid … utime (14th field overall) stime (15th)
      stats.set(Number(d), { ppid: Number(f[1]), ticks: Number(f[11]) + Number(f[12]) });
    } catch {
      // the process ended meanwhile
    }
  }
  let ticks = 0;
  const mine = new Set([rootPid]);
  // parents have smaller pids than most of their children, but not always: repeat until stable
  for (let grew = true; grew;) {
    grew = false;
    for (const [pid, st] of stats)
      if (!mine.has(pid) && mine.has(st.ppid)) {
        mine.add(pid);
        grew = true;
      }
  }
  for (const pid of mine) ticks += stats.get(pid)?.ticks ?? 0;
  return ticks * 10; // USER_HZ is 100 on Linux
}
// the PostgreSQL server's main process: the parent of this connection's backend
const pgPid = await sql<{ pid: number }>`select pg_backend_pid() as pid`
  .execute(db)
  .then((r) => {
    const st = readFileSync(`/proc/${r.rows[0]!.pid}/stat`, "utf8");
    return Number(st.slice(st.lastIndexOf(")") + 2).split(" ")[1]);
  })
  .catch(() => null);

/** The production server (scripts/serve.mjs) without its access log, with `workers` processes. */
async function startServer(workers: number): Promise<Server> {
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const nodeArgs =
    PROFILE_DIR && workers === 1 ? ["--cpu-prof", `--cpu-prof-dir=${PROFILE_DIR}`] : [];
  const child: ChildProcess = spawn(
    process.execPath,
    [...nodeArgs, path.join(ROOT, "scripts/serve.mjs"), serverEntry],
    {
      cwd: ROOT,
      env: {
        ...process.env,
        PORT: String(port),
        HOST: "127.0.0.1",
        NODE_ENV: "production",
        APP_URL: url,
        DATABASE_URL,
        SESSION_SECRET,
        JOBS_WORKER: "0",
        TW_ACCESS_LOG: "0",
        WEB_CONCURRENCY: String(workers),
      },
      stdio: ["ignore", "ignore", "inherit"],
    },
  );
  let exited = false;
  child.once("exit", () => (exited = true));
  const stop = async () => {
    if (exited) return;
    child.kill("SIGTERM");
    for (let i = 0; i < 100 && !exited; i++) await new Promise((r) => setTimeout(r, 100));
    if (!exited) child.kill("SIGKILL");
  };
  running.add(stop);
  const pid = child.pid!;
  for (let i = 0; ; i++) {
    if (exited) throw new Error("the server stopped before answering");
    try {
      if ((await fetch(`${url}/healthz`)).ok) break;
    } catch {
      // not listening yet
    }
    if (i > 150) throw new Error("the server did not answer /healthz within 30 s");
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    pid,
    stop: async () => {
      await stop();
      running.delete(stop);
    },
  };
}
const running = new Set<() => Promise<void>>();

async function stopAll() {
  for (const stop of running) await stop();
  await db.destroy();
  const admin = new URL(DATABASE_URL);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  await client.query(`drop database if exists "${DB_NAME}" with (force)`);
  await client.end();
  if (startedPg) sh("bash", ["scripts/pg.sh", "stop"]);
}

type CpuProfile = {
  nodes: {
    id: number;
    callFrame: { functionName: string; url: string; lineNumber: number };
    children?: number[];
  }[];
  startTime: number;
  samples: number[];
  timeDeltas: number[];
};

/**
 * Where the server's CPU time went during the action runs (`windows`, µs on the monotonic
 * clock the profile uses): the top frames by self time and self time by package.
 */
function printProfile(dir: string, windows: [number, number][]) {
  const files = readdirSync(dir)
    .filter((f) => f.endsWith(".cpuprofile"))
    .map((f) => path.join(dir, f))
    .sort((a, b) => statSync(b).mtimeMs - statSync(a).mtimeMs);
  if (!files[0]) return console.log(`  (no CPU profile in ${dir})`);
  const p = JSON.parse(readFileSync(files[0], "utf8")) as CpuProfile;
  const byId = new Map(p.nodes.map((n) => [n.id, n]));
  const inWindow = (t: number) => windows.some(([a, b]) => t >= a && t <= b);
  const frame = (id: number) => {
    const c = byId.get(id)!.callFrame;
    const where = c.url
      .replace(/^file:\/\//, "")
      .replace(/.*node_modules\//, "")
      .replace(/.*\/build\/server\//, "build/server/");
    return `${c.functionName || "(anonymous)"} ${where}${where ? `:${c.lineNumber + 1}` : ""}`;
  };
  const area = (id: number) => {
    const u = byId.get(id)!.callFrame.url;
    const m = /node_modules\/((@[^/]+\/)?[^/]+)/.exec(u);
    if (m) return m[1]!;
    if (u.includes("/build/server/")) return "the app (build/server)";
    if (u.startsWith("node:")) return "node internals";
    return u ? u : `(native) ${byId.get(id)!.callFrame.functionName}`;
  };
  const self = new Map<string, number>();
  const areas = new Map<string, number>();
  let t = p.startTime;
  let total = 0;
  for (let i = 0; i < p.samples.length; i++) {
    t += p.timeDeltas[i]!;
    if (!inWindow(t)) continue;
    const id = p.samples[i]!;
    const d = p.timeDeltas[i]!;
    total += d;
    self.set(frame(id), (self.get(frame(id)) ?? 0) + d);
    areas.set(area(id), (areas.get(area(id)) ?? 0) + d);
  }
  const top = (m: Map<string, number>, n: number) =>
    [...m]
      .sort((a, b) => b[1] - a[1])
      .slice(0, n)
      .map(([k, v]) => `    ${((100 * v) / total).toFixed(1).padStart(5)} %  ${k}`)
      .join("\n");
  console.log(
    `server CPU profile during the action runs (${(total / 1e6).toFixed(1)} s sampled, ${files[0]}):`,
  );
  console.log(`  self time by package:\n${top(areas, 12)}`);
  console.log(`  top frames by self time:\n${top(self, 25)}`);
}

const editRows = async () =>
  Number(
    (
      await db
        .selectFrom("package_edits")
        .select((eb) => eb.fn.countAll<string>().as("n"))
        .executeTakeFirstOrThrow()
    ).n,
  );

try {
  // ---- the load ----
  const versions = new Map<number, number>(packages.map((id) => [id, 1]));
  type Figures = {
    median: number;
    p95: number;
    rps: number;
    total: number;
    non2xx: number;
    errors: number;
    /** edit-log rows written per second during the run */
    editsPerSecond: number;
    /** CPU per request: the app server's processes, and PostgreSQL's (null when unknown) */
    appCpuMs: number;
    pgCpuMs: number | null;
  };
  /** process.hrtime in µs: the same monotonic clock as the server's CPU profile */
  const usNow = () => Number(process.hrtime.bigint() / 1000n);
  const actionWindows: [number, number][] = [];

  function stats(
    samples: number[],
    seconds: number,
    non2xx: number,
    errors: number,
    edits: number,
  ): Figures {
    const s = [...samples].sort((a, b) => a - b);
    const at = (q: number) => s[Math.min(s.length - 1, Math.floor(q * s.length))] ?? NaN;
    return {
      median: at(0.5),
      p95: at(0.95),
      rps: s.length / seconds,
      total: s.length,
      non2xx,
      errors,
      editsPerSecond: edits / seconds,
      appCpuMs: 0,
      pgCpuMs: null,
    };
  }

  async function run(
    server: Server,
    connections: number,
    seconds: number,
    kind: "healthz" | "action",
  ): Promise<Figures> {
    // a run ends with answers in flight; their saves landed, so read every version back first
    for (const r of await db
      .selectFrom("packages")
      .select(["id", "version"])
      .where("id", "in", packages)
      .execute())
      versions.set(r.id, r.version);
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
                Origin: server.url,
                "Content-Type": "application/x-www-form-urlencoded",
              },
              // a request leases a package no other request is editing and names the version
              // its last answer brought; the answer hands the package back
              setupRequest: (req, context) => {
                context.pkg = free.pop() ?? packages[0];
                context.version = versions.get(context.pkg)!;
                const partId = cylinders[context.version % 2]!;
                req.path = `/packages/${context.pkg}/bench.data`;
                req.body = new URLSearchParams({
                  intent: "set-part",
                  slot: "cylinder",
                  partId: String(partId),
                  expectedRevision: String(context.version),
                }).toString();
                return req;
              },
              onResponse: (status, body, context) => {
                const pkg = context.pkg as number;
                if (status === 200) {
                  versions.set(pkg, context.version + 1);
                  free.push(pkg);
                  return;
                }
                if (refusals++ < 3) console.log(`  (a ${status} answer: ${body.slice(0, 160)})`);
                // read the version back before the package is used again
                void db
                  .selectFrom("packages")
                  .select("version")
                  .where("id", "=", pkg)
                  .executeTakeFirstOrThrow()
                  .then((r) => {
                    versions.set(pkg, r.version);
                    free.push(pkg);
                  });
              },
            },
          ];
    const editsBefore = kind === "action" ? await editRows() : 0;
    const cpuBefore = [cpuMs(server.pid), pgPid ? cpuMs(pgPid) : 0];
    const started = usNow();
    const instance = autocannon({
      url: server.url,
      connections,
      duration: seconds,
      pipelining: 1,
      requests,
    });
    instance.on("response", (_client: unknown, _status: number, _bytes: number, ms: number) =>
      samples.push(ms),
    );
    const result = await instance;
    const cpuAfter = [cpuMs(server.pid), pgPid ? cpuMs(pgPid) : 0];
    if (kind === "action") actionWindows.push([started, usNow()]);
    const edits = kind === "action" ? (await editRows()) - editsBefore : 0;
    const f = stats(samples, result.duration || seconds, result.non2xx, result.errors, edits);
    f.appCpuMs = (cpuAfter[0]! - cpuBefore[0]!) / Math.max(1, f.total);
    f.pgCpuMs = pgPid ? (cpuAfter[1]! - cpuBefore[1]!) / Math.max(1, f.total) : null;
    return f;
  }

  const load = (await import("node:os")).loadavg();
  const rows: { what: string; workers: number; c: number; f: Figures }[] = [];
  for (const workers of PROFILE_DIR ? [1] : [1, 2]) {
    const server = await startServer(workers);
    await run(server, 10, 2, "action"); // warm: JIT, the rule cache, the pool's connections
    actionWindows.length = 0;
    await run(server, 10, 1, "healthz");
    for (const c of CONNECTIONS) {
      rows.push({
        what: "/healthz (floor)",
        workers,
        c,
        f: await run(server, c, SECONDS, "healthz"),
      });
      rows.push({ what: "bench action", workers, c, f: await run(server, c, SECONDS, "action") });
    }
    await server.stop();
  }
  const loadAfter = (await import("node:os")).loadavg();
  // what one request's rules found: the working copy of the package edited most
  const sample = await db
    .selectFrom("packages")
    .select(["findings", "version"])
    .where("id", "in", packages)
    .orderBy("version", "desc")
    .executeTakeFirstOrThrow();
  const lastEdit = await db
    .selectFrom("package_edits")
    .select("change")
    .where("package_id", "in", packages)
    .orderBy("id", "desc")
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
    "  between two parts, naming the working copy's version: check the session, parse, read the package row, its parts and",
  );
  console.log(
    "  the rules' fingerprint (one query; the rules are cached), recompute with calc/, evaluate every rule, save the working",
  );
  console.log(
    "  copy and one edit-log row (one statement), answer the new state. No two requests in flight edit the same package, so",
  );
  console.log(
    "  none is refused as stale. The browser's follow-up reload of the page shell is not included.",
  );
  console.log(
    `  load average of the machine (1 min) before / after: ${load[0]!.toFixed(2)} / ${loadAfter[0]!.toFixed(2)} on ${(await import("node:os")).cpus().length} cores`,
  );
  console.log(
    "  what              workers conn   median      p95      req/s  of floor   requests  non-2xx  edit rows/s  CPU ms/request (app + PostgreSQL)",
  );
  for (const r of rows) {
    const floor = rows.find(
      (x) => x.what !== "bench action" && x.workers === r.workers && x.c === r.c,
    )!.f;
    const share = r.what === "bench action" ? `${((100 * r.f.rps) / floor.rps).toFixed(0)} %` : "";
    console.log(
      `  ${r.what.padEnd(17)} ${String(r.workers).padStart(7)} ${String(r.c).padStart(4)} ${ms(r.f.median)} ${ms(r.f.p95)} ${r.f.rps.toFixed(0).padStart(10)} ${share.padStart(9)} ${String(r.f.total).padStart(10)} ${String(r.f.non2xx + r.f.errors).padStart(8)} ${(r.what === "bench action" ? r.f.editsPerSecond.toFixed(0) : "").padStart(12)}  ${r.f.appCpuMs.toFixed(2)} + ${r.f.pgCpuMs === null ? "?" : r.f.pgCpuMs.toFixed(2)}`,
    );
  }
  const at10 = rows.find((r) => r.what === "bench action" && r.c === 10 && r.workers === 1)!.f;
  const floor10 = rows.find((r) => r.what !== "bench action" && r.c === 10 && r.workers === 1)!.f;
  const share10 = at10.rps / floor10.rps;
  console.log(
    `  targets (1 worker, 10 connections): action p95 ≤ 50 ms → ${at10.p95.toFixed(1)} ms (${at10.p95 <= 50 ? "met" : "missed"}); action req/s ≥ 1/3 of /healthz → ${(100 * share10).toFixed(0)} % (${share10 >= 1 / 3 ? "met" : "missed"})`,
  );
  console.log(
    `  rules that fire per request: ${fired.length} of ${ruleCount} findings (${byKind}, ${fired.filter((f) => f.error).length} not checkable), last change "${lastEdit.change}"`,
  );
  if (PROFILE_DIR) printProfile(PROFILE_DIR, actionWindows);

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
