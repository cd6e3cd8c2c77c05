// Security headers on every answer of the built server (scripts/serve.mjs): pages, their
// .data answers, resource routes, static files and the not-found page. The page's
// Content-Security-Policy carries a fresh nonce per request, every inline script of the
// page carries that nonce, and scripts are never allowed inline without it.
import { request as httpRequest } from "node:http";
import type { AddressInfo } from "node:net";
import express from "express";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createDb } from "../../db/connect";
import type { Database } from "../../db/schema";
import { securityHeadersMiddleware } from "../../scripts/serve.mjs";
import { createSession } from "~/lib/auth/session.server";
import routeConfig from "~/routes";
import { freshDatabase, startApp, type App, type Cluster } from "./support";

let cluster: Cluster;
let db: Kysely<Database>;
let app: App;
let cookie = "";
const ids: Record<string, number> = {};

beforeAll(async () => {
  cluster = await freshDatabase(inject("faultCluster"), "torquewright_faults_headers");
  db = createDb(cluster.url, 2);
  const owner = await db
    .selectFrom("users")
    .select("id")
    .where("role", "=", "owner")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  cookie = (await createSession(db, owner.id)).split(";")[0]!;
  const first = async (table: "packages" | "parts" | "fit_rules") =>
    (await db.selectFrom(table).select("id").orderBy("id").executeTakeFirstOrThrow()).id;
  ids.packages = await first("packages");
  ids.parts = await first("parts");
  ids.rules = await first("fit_rules");
  app = await startApp(cluster.url, { JOBS_WORKER: "0" });
});

afterAll(async () => {
  await app?.kill("SIGTERM");
  await db?.destroy();
  await cluster?.drop();
});

type Entry = { path?: string; index?: boolean; children?: Entry[] };
/** Every path of app/routes.ts, with its params filled in from the seeded database. */
function routePaths(): string[] {
  const out: string[] = [];
  const walk = (entries: Entry[], prefix: string) => {
    for (const e of entries) {
      const p = e.index ? prefix || "/" : `${prefix}/${e.path ?? ""}`.replace(/\/+/g, "/");
      if (e.path !== undefined || e.index) out.push(p);
      if (e.children) walk(e.children, p === "/" ? "" : p);
    }
  };
  walk(routeConfig as Entry[], "");
  return out.map((p) =>
    p
      .replace(/^\/(packages|parts|rules)\/:id/, (_, t: string) => `/${t}/${ids[t]}`)
      .replace(/:id/g, "1")
      .replace(/:token/g, "not-a-real-token")
      .replace(/\*$/, "no-such-page"),
  );
}

function policy(res: Response): Map<string, string[]> {
  const header = res.headers.get("Content-Security-Policy") ?? "";
  return new Map(
    header
      .split(";")
      .map((d) => d.trim().split(/\s+/))
      .filter((d) => d[0])
      .map(([name, ...values]) => [name!, values]),
  );
}

function expectSecurityHeaders(res: Response, what: string) {
  const csp = policy(res);
  const script = csp.get("script-src") ?? [];
  expect(script, what).toContain("'self'");
  expect(
    script.some((v) => /^'nonce-[A-Za-z0-9+/]{20,}={0,2}'$/.test(v)),
    what,
  ).toBe(true);
  expect(script, what).not.toContain("'unsafe-inline'");
  expect(script, what).not.toContain("'unsafe-eval'");
  expect(csp.get("default-src"), what).toEqual(["'self'"]);
  expect(csp.get("frame-ancestors"), what).toEqual(["'none'"]);
  expect(csp.get("object-src"), what).toEqual(["'none'"]);
  expect(res.headers.get("X-Content-Type-Options"), what).toBe("nosniff");
  expect(res.headers.get("Referrer-Policy"), what).toBe("same-origin");
  expect(res.headers.get("X-Frame-Options"), what).toBe("DENY");
  // served over http here: no HSTS (it would pin a plain-http host)
  expect(res.headers.get("Strict-Transport-Security"), what).toBeNull();
}

const get = (path: string, signedIn: boolean) =>
  fetch(`${app.url}${path}`, {
    redirect: "manual",
    headers: signedIn ? { Cookie: cookie } : {},
  });

describe("security headers", () => {
  it("are on every route's answer, signed in and out, pages and their .data", async () => {
    const paths = routePaths();
    expect(paths.length).toBeGreaterThanOrEqual(routeConfig.length);
    const statuses = new Set<number>();
    for (const path of paths) {
      for (const signedIn of [true, false]) {
        const res = await get(path, signedIn);
        statuses.add(res.status);
        expectSecurityHeaders(res, `${path} (${signedIn ? "owner" : "signed out"})`);
        await res.arrayBuffer();
      }
      const data = await get(`${path === "/" ? "/_root" : path}.data`, true);
      expectSecurityHeaders(data, `${path}.data`);
      await data.arrayBuffer();
    }
    // pages, redirects to sign-in and refusals were all among them
    expect([...statuses].sort()).toEqual(expect.arrayContaining([200, 302, 404]));
  });

  it("are on static files too", async () => {
    const html = await (await get("/", true)).text();
    const asset = html.match(/\/assets\/[^"']+\.js/)?.[0];
    expect(asset).toMatch(/^\/assets\//);
    for (const path of [asset!, "/favicon.svg"]) {
      const res = await get(path, false);
      expect(res.status, path).toBe(200);
      expectSecurityHeaders(res, path);
      await res.arrayBuffer();
    }
  });

  it("give each page a fresh nonce, and every inline script of the page carries it", async () => {
    const nonces = new Set<string>();
    for (const path of ["/", "/packages", `/packages/${ids.packages}/bench`, "/login", "/nope"]) {
      for (let i = 0; i < 2; i++) {
        const signedIn = path !== "/login";
        const res = await get(path, signedIn);
        const nonce = (policy(res).get("script-src") ?? [])
          .find((v) => v.startsWith("'nonce-"))!
          .slice("'nonce-".length, -1);
        expect(nonces.has(nonce), `${path}: a nonce seen before`).toBe(false);
        nonces.add(nonce);
        const html = await res.text();
        const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
        expect(scripts.length, path).toBeGreaterThanOrEqual(2);
        for (const tag of scripts) expect(tag, path).toContain(`nonce="${nonce}"`);
      }
    }
    expect(nonces.size).toBe(10);
  });

  it("add HSTS only when the app's address is https", async () => {
    const answer = async (appUrl: string) => {
      const server = express()
        .use(securityHeadersMiddleware(appUrl))
        .get("/", (_req, res) => {
          res.send("ok");
        })
        .listen(0, "127.0.0.1");
      await new Promise((r) => server.once("listening", r));
      try {
        return await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/`);
      } finally {
        server.close();
      }
    };
    expect(
      (await answer("https://shop.example.test")).headers.get("Strict-Transport-Security"),
    ).toBe("max-age=31536000; includeSubDomains");
    expect((await answer("http://127.0.0.1:3000")).headers.get("Strict-Transport-Security")).toBe(
      null,
    );
  });
});

describe("the same-origin check behind the real server", () => {
  it("refuses a post whose Host and Origin both name another site", async () => {
    const send = (host: string, origin: string) =>
      new Promise<number>((resolve, reject) => {
        const u = new URL(`${app.url}/login`);
        const req = httpRequest(
          {
            host: u.hostname,
            port: u.port,
            path: "/login",
            method: "POST",
            headers: {
              Host: host,
              Origin: origin,
              "Content-Type": "application/x-www-form-urlencoded",
            },
          },
          (res) => {
            res.resume();
            resolve(res.statusCode ?? 0);
          },
        );
        req.once("error", reject);
        req.end("email=someone%40staff.test&password=x");
      });
    expect(await send("evil.test", "http://evil.test")).toBe(403);
    // the same post from our own page is not refused for its origin
    expect(await send(new URL(app.url).host, app.url)).not.toBe(403);
  });
});
