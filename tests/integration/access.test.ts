// Who may open what: every route × every role (and signed out) → the expected outcome,
// against the real test database.
//
// How it works: each row names a path (and method). A small dispatcher matches the path
// against the real route config (app/routes.ts, with React Router's own matcher), loads
// that route module and calls its `loader` (GET) or `action` (POST) with a real Request
// signed in as a fresh user of each role (a real session row and signed cookie). What it
// returns or throws is classified:
//   "ok"        rendered: data, a 2xx, or a 4xx that shows the form again with errors
//   "login"     a redirect to /login (signed out)
//   "redirect"  a redirect elsewhere
//   403 / 404   refused / nothing there
//
// Every route in app/routes.ts must appear here at least once (the last test checks).
// Adding a route? Add a row: { path, method?, body?, expect: { signedOut, owner, builder,
// service_writer, apprentice } }. `all(x)` and `staffOnly(...)` shorten common rows.
import { matchRoutes, type RouteObject } from "react-router";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Role } from "../../db/schema/core";
import { startMailCatcher } from "../../scripts/services/mail-catcher";
import { createTestUser, requestAs, signedOutRequest, type TestUser } from "../support/auth";

// /dev/outbox exists only with the local mail server; give it one for these rows.
const catcher = await startMailCatcher({ quiet: true });
process.env.LOCAL_MAIL_API_URL = catcher.apiUrl;
const { getDb } = await import("~/lib/db.server");
const routeConfig = (await import("~/routes")).default;

type Outcome = "ok" | "login" | "redirect" | 401 | 403 | 404;
type Who = "signedOut" | Role;
type Row = {
  path: string;
  method?: "GET" | "POST";
  body?: Record<string, string>;
  expect: Record<Who, Outcome>;
};

const all = (o: Outcome): Row["expect"] => ({
  signedOut: o,
  owner: o,
  builder: o,
  service_writer: o,
  apprentice: o,
});
/** Signed-out visitors go to sign-in; the listed roles get `ok`, the others 403. */
const staffOnly = (...roles: Role[]): Row["expect"] => ({
  signedOut: "login",
  owner: roles.includes("owner") ? "ok" : 403,
  builder: roles.includes("builder") ? "ok" : 403,
  service_writer: roles.includes("service_writer") ? "ok" : 403,
  apprentice: roles.includes("apprentice") ? "ok" : 403,
});
const signedInRedirect: Row["expect"] = {
  signedOut: "ok",
  owner: "redirect",
  builder: "redirect",
  service_writer: "redirect",
  apprentice: "redirect",
};

export const ROWS: Row[] = [
  { path: "/", expect: staffOnly("owner", "builder", "service_writer", "apprentice") },
  { path: "/healthz", expect: all("ok") },
  { path: "/login", expect: signedInRedirect },
  { path: "/login", method: "POST", body: { email: "", password: "" }, expect: all("ok") },
  { path: "/logout", expect: all("redirect") },
  { path: "/logout", method: "POST", expect: all("login") },
  { path: "/invite/not-a-token", expect: all("ok") },
  { path: "/invite/not-a-token", method: "POST", body: { name: "" }, expect: all("ok") },
  { path: "/reset", expect: all("ok") },
  { path: "/reset", method: "POST", body: { email: "" }, expect: all("ok") },
  { path: "/reset/not-a-token", expect: all("ok") },
  { path: "/reset/not-a-token", method: "POST", body: { password: "" }, expect: all("ok") },
  { path: "/staff", expect: staffOnly("owner") },
  {
    path: "/staff",
    method: "POST",
    body: { intent: "invite", email: "" },
    expect: staffOnly("owner"),
  },
  { path: "/dev/outbox", expect: staffOnly("owner") },
  { path: "/dev/outbox/999999", expect: { ...staffOnly("owner"), owner: 404 } },
  { path: "/packages", expect: staffOnly("owner", "builder", "service_writer") },
  { path: "/packages/new", expect: staffOnly("owner", "builder", "service_writer") },
  {
    path: "/packages/new",
    method: "POST",
    body: { mode: "scratch", name: "" },
    expect: staffOnly("owner", "builder", "service_writer"),
  },
  {
    path: "/packages/999999",
    expect: {
      ...staffOnly("owner", "builder", "service_writer"),
      owner: 404,
      builder: 404,
      service_writer: 404,
    },
  },
  {
    path: "/packages/999999",
    method: "POST",
    body: { intent: "status", to: "quoted" },
    expect: staffOnly("owner", "builder", "service_writer"),
  },
  {
    path: "/packages/999999",
    method: "POST",
    body: { intent: "restore", revision: "1", expectedRevision: "1" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  {
    path: "/packages/999999/bench",
    expect: {
      ...staffOnly("owner", "builder", "service_writer"),
      owner: 404,
      builder: 404,
      service_writer: 404,
    },
  },
  {
    path: "/packages/999999/bench",
    method: "POST",
    body: { intent: "set-units", units: "metric" },
    expect: staffOnly("owner", "builder", "service_writer"),
  },
  {
    path: "/packages/999999/bench",
    method: "POST",
    body: { intent: "clear-slot", slot: "cam", expectedRevision: "1" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  // the dyno log and build photos: builders and the owner log and remove, the service
  // writer reads; apprentices see no package's dyno runs or photos
  {
    path: "/packages/999999/dyno",
    expect: {
      ...staffOnly("owner", "builder", "service_writer"),
      owner: 404,
      builder: 404,
      service_writer: 404,
    },
  },
  {
    path: "/packages/999999/dyno",
    method: "POST",
    body: { intent: "counts", runId: "1", counts: "true" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  {
    path: "/packages/999999/dyno/upload",
    method: "POST",
    body: { label: "x" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  {
    path: "/packages/999999/photos",
    method: "POST",
    body: { caption: "x" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  {
    path: "/packages/999999/photos/1",
    method: "POST",
    body: { intent: "remove" },
    expect: { ...staffOnly("owner", "builder"), owner: 404, builder: 404 },
  },
  {
    path: "/files/999999",
    expect: {
      ...staffOnly("owner", "builder", "service_writer"),
      owner: 404,
      builder: 404,
      service_writer: 404,
    },
  },
  // JSON routes answer 401 instead of sending a signed-out caller to the sign-in form
  {
    path: "/api/parts",
    expect: { ...staffOnly("owner", "builder", "service_writer", "apprentice"), signedOut: 401 },
  },
  {
    path: "/api/packages/999999",
    expect: {
      ...staffOnly("owner", "builder", "service_writer"),
      signedOut: 401,
      owner: 404,
      builder: 404,
      service_writer: 404,
    },
  },
  {
    path: "/api/calc",
    method: "POST",
    body: { boreMm: "x" },
    expect: { ...staffOnly("owner", "builder", "service_writer", "apprentice"), signedOut: 401 },
  },
  { path: "/parts", expect: staffOnly("owner", "builder", "service_writer", "apprentice") },
  { path: "/parts", method: "POST", body: { label: "" }, expect: staffOnly("owner") },
  { path: "/parts/new", expect: staffOnly("owner") },
  { path: "/parts/new", method: "POST", body: { part_number: "" }, expect: staffOnly("owner") },
  { path: "/parts/import", expect: staffOnly("owner") },
  {
    path: "/parts/import",
    method: "POST",
    body: { intent: "preview" },
    expect: staffOnly("owner"),
  },
  {
    path: "/parts/export.csv",
    expect: staffOnly("owner", "builder", "service_writer", "apprentice"),
  },
  {
    path: "/parts/999999",
    expect: {
      ...staffOnly("owner", "builder", "service_writer", "apprentice"),
      owner: 404,
      builder: 404,
      service_writer: 404,
      apprentice: 404,
    },
  },
  {
    path: "/parts/999999",
    method: "POST",
    body: { intent: "archive" },
    expect: { ...staffOnly("owner"), owner: 404 },
  },
  { path: "/rules", expect: staffOnly("owner", "builder", "service_writer", "apprentice") },
  { path: "/rules/new", expect: staffOnly("owner") },
  {
    path: "/rules/new",
    method: "POST",
    body: { intent: "save", name: "" },
    expect: staffOnly("owner"),
  },
  {
    path: "/rules/999999",
    expect: {
      ...staffOnly("owner", "builder", "service_writer", "apprentice"),
      owner: 404,
      builder: 404,
      service_writer: 404,
      apprentice: 404,
    },
  },
  {
    path: "/rules/999999",
    method: "POST",
    body: { intent: "save" },
    expect: { ...staffOnly("owner"), owner: 404 },
  },
  { path: "/no-such-page", expect: all(404) },
];

// ---- the dispatcher ----

type Module = { loader?: (args: unknown) => unknown; action?: (args: unknown) => unknown };
const modules = import.meta.glob<Module>("../../app/routes/*.{ts,tsx}");

type ConfigEntry = {
  id?: string;
  path?: string;
  index?: boolean;
  file: string;
  children?: ConfigEntry[];
};
const toObjects = (entries: ConfigEntry[]): RouteObject[] =>
  entries.map((e) =>
    e.index
      ? ({ id: e.file, index: true } as RouteObject)
      : ({
          id: e.file,
          path: e.path,
          children: e.children ? toObjects(e.children) : undefined,
        } as RouteObject),
  );
const routeObjects = toObjects(routeConfig as ConfigEntry[]);
const configFiles = (entries: ConfigEntry[]): string[] =>
  entries.flatMap((e) => [e.file, ...configFiles(e.children ?? [])]);

async function dispatch(request: Request): Promise<unknown> {
  const url = new URL(request.url);
  const matches = matchRoutes(routeObjects, url.pathname);
  const leaf = matches?.at(-1);
  if (!leaf) throw new Error(`no route matches ${url.pathname}`);
  const load = modules[`../../app/${leaf.route.id}`];
  if (!load) throw new Error(`route module ${leaf.route.id} not found`);
  const mod = await load();
  const fn = request.method === "GET" ? mod.loader : mod.action;
  if (!fn) return request.method === "GET" ? null : new Response(null, { status: 405 });
  return fn({ request, params: leaf.params, context: {} });
}

function classify(value: unknown): Outcome | `status ${number}` {
  let status = 200;
  let location: string | null = null;
  if (value instanceof Response) {
    status = value.status;
    location = value.headers.get("Location");
  } else if (
    value &&
    typeof value === "object" &&
    (value as { type?: string }).type === "DataWithResponseInit"
  ) {
    status = (value as { init?: { status?: number } }).init?.status ?? 200;
  }
  if (status >= 300 && status < 400) return location?.startsWith("/login") ? "login" : "redirect";
  if (status === 403) return 403;
  if (status === 404) return 404;
  if (status < 300 || (status >= 400 && status < 500 && status !== 401 && status !== 405))
    return "ok";
  if (
    status === 401 &&
    value instanceof Response &&
    value.headers.get("Content-Type")?.includes("json")
  )
    return 401; // a JSON route, signed out
  if (status === 401) return "ok"; // the sign-in form answering a wrong password
  return `status ${status}`;
}

async function outcome(request: Request) {
  try {
    return classify(await dispatch(request));
  } catch (thrown) {
    if (thrown instanceof Response || (thrown && typeof thrown === "object" && "init" in thrown))
      return classify(thrown);
    throw thrown;
  }
}

const users = {} as Record<Role, TestUser>;
beforeAll(async () => {
  for (const role of ["owner", "builder", "service_writer", "apprentice"] as const)
    users[role] = await createTestUser(getDb(), role);
});

afterAll(() => catcher.stop());

describe("access table", () => {
  for (const row of ROWS) {
    const method = row.method ?? "GET";
    describe(`${method} ${row.path}`, () => {
      for (const who of Object.keys(row.expect) as Who[]) {
        it(`${who} → ${row.expect[who]}`, async () => {
          const init: RequestInit = {
            method,
            body: method === "POST" ? new URLSearchParams(row.body ?? {}) : undefined,
          };
          const request =
            who === "signedOut"
              ? signedOutRequest(row.path, init)
              : await requestAs(users[who], row.path, init);
          expect(await outcome(request)).toBe(row.expect[who]);
        });
      }
    });
  }

  it("refuses every POST sent from another site, whoever is signed in", async () => {
    for (const row of ROWS.filter((r) => r.method === "POST")) {
      for (const who of ["signedOut", "owner"] as const) {
        const init: RequestInit = {
          method: "POST",
          body: new URLSearchParams(row.body ?? {}),
          headers: { Origin: "http://elsewhere.test" },
        };
        const request =
          who === "signedOut"
            ? signedOutRequest(row.path, init)
            : await requestAs(users[who], row.path, init);
        expect(await outcome(request), `${who} POST ${row.path}`).toBe(403);
      }
    }
  });

  it("lists every route of app/routes.ts", () => {
    const covered = new Set(
      ROWS.map(
        (r) => matchRoutes(routeObjects, new URL(r.path, "http://x").pathname)?.at(-1)?.route.id,
      ),
    );
    const missing = configFiles(routeConfig as ConfigEntry[]).filter((f) => !covered.has(f));
    expect(missing, "routes without a row in the access table").toEqual([]);
  });
});
