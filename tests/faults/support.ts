// Real processes for the fault tests: a throwaway PostgreSQL cluster of our own
// (scripts/pg.sh in a temporary data folder, on a port of its own), the built production
// server (scripts/serve.mjs) in a child process, and helpers to talk to it over HTTP.
import { execFile, spawn, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, chmodSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import pg from "pg";
import { UNSAFE_decodeViaTurboStream as decodeTurboStream } from "react-router";
import { env } from "~/lib/env.server";
import { waitFor } from "../support/mail";

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
export const SERVER_ENTRY = path.join(ROOT, "build/server/index.js");
const run = promisify(execFile);

/** A port nobody listens on right now (the OS picks it). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

export type ClusterInfo = { port: number; dataDir: string };
export const TEMPLATE_DB = "torquewright_faults_template";

function pgsh(info: ClusterInfo, cmd: "start" | "stop") {
  const pgEnv: NodeJS.ProcessEnv = {
    ...process.env,
    TW_DATA_DIR: info.dataDir,
    TW_PG_PORT: String(info.port),
    TW_DB_NAME: TEMPLATE_DB,
    // a throw-away cluster: durability does not matter, speed does
    TW_PG_OPTIONS: "-c fsync=off -c synchronous_commit=off -c full_page_writes=off",
  };
  delete pgEnv.DATABASE_URL;
  return run("bash", [path.join(ROOT, "scripts/pg.sh"), cmd], { cwd: ROOT, env: pgEnv }).then(
    () => undefined,
  );
}

const urlOf = (info: ClusterInfo, db: string) => `postgres://postgres@127.0.0.1:${info.port}/${db}`;

/**
 * For the global set-up: a PostgreSQL cluster started by scripts/pg.sh in a temporary
 * data folder (port TW_FAULT_PG_PORT, else a free one), with a migrated, seeded template
 * database the tests copy.
 */
export async function startSharedCluster(): Promise<
  ClusterInfo & { destroy: () => Promise<void> }
> {
  const port = Number(process.env.TW_FAULT_PG_PORT) || (await freePort());
  const dataDir = mkdtempSync(path.join(tmpdir(), "tw-faults-"));
  chmodSync(dataDir, 0o755); // the postgres user keeps its cluster inside it
  const info = { port, dataDir };
  await pgsh(info, "start");
  const e = { ...process.env, DATABASE_URL: urlOf(info, TEMPLATE_DB) };
  await run("npx", ["tsx", "db/reset.ts"], { cwd: ROOT, env: e });
  await run("npx", ["tsx", "db/seed.ts"], { cwd: ROOT, env: e });
  return {
    ...info,
    destroy: async () => {
      await pgsh(info, "stop").catch(() => {});
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export type Cluster = {
  url: string;
  /** scripts/pg.sh start / stop on the shared cluster (the files run one at a time) */
  start: () => Promise<void>;
  stop: () => Promise<void>;
  /** drops this test's database */
  drop: () => Promise<void>;
};

/** A fresh copy of the seeded template database on the shared cluster. */
export async function freshDatabase(info: ClusterInfo, name: string): Promise<Cluster> {
  const admin = new pg.Client({ connectionString: urlOf(info, "postgres") });
  await admin.connect();
  try {
    await admin.query(`drop database if exists "${name}" with (force)`);
    await admin.query(`create database "${name}" template "${TEMPLATE_DB}"`);
  } finally {
    await admin.end();
  }
  return {
    url: urlOf(info, name),
    start: () => pgsh(info, "start"),
    stop: () => pgsh(info, "stop"),
    drop: async () => {
      const c = new pg.Client({ connectionString: urlOf(info, "postgres") });
      await c.connect();
      await c.query(`drop database if exists "${name}" with (force)`).finally(() => c.end());
    },
  };
}

export type App = {
  url: string;
  process: ChildProcess;
  /** what the server printed (stdout and stderr) */
  output: () => string;
  exited: () => boolean;
  kill: (signal: NodeJS.Signals) => Promise<void>;
};

/** The built production server against `databaseUrl`, answering /healthz before it returns. */
export async function startApp(databaseUrl: string, extraEnv: Record<string, string> = {}) {
  if (!existsSync(SERVER_ENTRY))
    throw new Error(`no build at ${SERVER_ENTRY}: run "npx react-router build" first`);
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, [path.join(ROOT, "scripts/serve.mjs"), SERVER_ENTRY], {
    cwd: ROOT,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: "127.0.0.1",
      NODE_ENV: "production",
      APP_URL: url,
      DATABASE_URL: databaseUrl,
      DATABASE_POOL_MAX: "4",
      SESSION_SECRET: env().SESSION_SECRET,
      TW_ACCESS_LOG: "0",
      WEB_CONCURRENCY: "1",
      ...extraEnv,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout!.on("data", (d) => (out += String(d)));
  child.stderr!.on("data", (d) => (out += String(d)));
  let exited = false;
  const gone = new Promise<void>((r) =>
    child.once("exit", () => {
      exited = true;
      r();
    }),
  );
  const app: App = {
    url,
    process: child,
    output: () => out,
    exited: () => exited,
    kill: async (signal) => {
      if (!exited) child.kill(signal);
      await gone;
    },
  };
  await waitFor(
    async () => {
      if (exited) throw new Error(`the server stopped before answering:\n${out}`);
      return fetch(`${url}/healthz`).then(
        (r) => r.ok,
        () => false,
      );
    },
    30_000,
    "the app server's /healthz",
  );
  return app;
}

/** An answer from a `.data` URL (React Router's single fetch), decoded. */
export async function decodeData(res: Response): Promise<unknown> {
  const decoded = await decodeTurboStream(res.body!, globalThis);
  await decoded.done;
  return decoded.value;
}
