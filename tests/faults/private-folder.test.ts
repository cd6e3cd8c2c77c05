// A fresh clone in a folder only its owner may enter (what `mktemp -d` makes, or a
// private home) starts its database: as root, scripts/pg.sh keeps everything the
// postgres user reads or writes — cluster, socket, log — in a folder that user can
// reach, and runs the server's tools from there.
import { execFile } from "node:child_process";
import { chmodSync, existsSync, mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { freePort, ROOT } from "./support";

const run = promisify(execFile);
const isRoot = process.getuid?.() === 0;
const made: string[] = [];

afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

/** The checkout as it stands (committed, plus changes not yet committed), cloned into `dir`. */
async function cloneInto(dir: string): Promise<string> {
  const clone = path.join(dir, "torquewright");
  await run("git", ["clone", "--quiet", "--no-hardlinks", ROOT, clone]);
  const { stdout: diff } = await run("git", ["-C", ROOT, "diff", "HEAD", "--binary"], {
    maxBuffer: 64 * 1024 * 1024,
  });
  if (diff.trim()) {
    const apply = execFile("git", ["-C", clone, "apply", "--whitespace=nowarn", "-"]);
    const done = new Promise<void>((resolve, reject) =>
      apply.once("exit", (code) =>
        code === 0 ? resolve() : reject(new Error(`git apply: ${code}`)),
      ),
    );
    apply.stdin!.end(diff);
    await done;
  }
  return clone;
}

describe("a fresh clone in a mode-700 folder", () => {
  it("starts and stops its PostgreSQL with scripts/pg.sh", async () => {
    const home = mkdtempSync(path.join(tmpdir(), "tw-private-"));
    made.push(home);
    expect(statSync(home).mode & 0o777).toBe(0o700);
    // stands in for /var/tmp; pg.sh makes its folder in it under a umask of 077
    const fallback = mkdtempSync(path.join(tmpdir(), "tw-pg-fallback-"));
    chmodSync(fallback, 0o755);
    made.push(fallback);
    const clone = await cloneInto(home);
    const port = await freePort();
    const pgEnv: NodeJS.ProcessEnv = {
      ...process.env,
      TW_PG_PORT: String(port),
      TW_PG_FALLBACK_DIR: path.join(fallback, "clusters"),
      TW_PG_OPTIONS: "-c fsync=off -c synchronous_commit=off -c full_page_writes=off",
    };
    delete pgEnv.DATABASE_URL;
    delete pgEnv.TW_DATA_DIR;
    delete pgEnv.TW_DB_NAME;
    const pgsh = (cmd: string) =>
      run("bash", ["-c", `umask 077 && exec bash scripts/pg.sh ${cmd}`], {
        cwd: clone,
        env: pgEnv,
      });

    const started = await pgsh("start");
    try {
      const client = new pg.Client({
        connectionString: `postgres://postgres@127.0.0.1:${port}/torquewright`,
      });
      await client.connect();
      const { rows } = await client.query<{ dir: string; one: number }>(
        "select current_setting('data_directory') as dir, 1 as one",
      );
      await client.end();
      expect(rows[0]!.one).toBe(1);
      const dataDir = rows[0]!.dir;
      if (isRoot) {
        // out of the clone, which the postgres user cannot enter
        expect(dataDir.startsWith(path.join(fallback, "clusters") + "/")).toBe(true);
        expect(started.stderr).toContain(`data: ${dataDir}, log: ${dataDir}.log`);
        expect(existsSync(`${dataDir}.log`)).toBe(true);
        expect(existsSync(path.join(clone, ".data", "pg.log"))).toBe(false);
      } else {
        expect(dataDir).toBe(path.join(clone, ".data", "pg"));
      }
      await expect(pgsh("status")).resolves.toBeDefined();
    } finally {
      await pgsh("stop");
    }
    await expect(pgsh("status")).rejects.toMatchObject({ code: 1 });
  });
});
