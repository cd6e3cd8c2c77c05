// Shared by the hostile-input tests: every route of app/routes.ts (matched with React
// Router's own matcher, as the access table does), a dispatcher that calls the matched
// module's loader or action the way the server does (`/x.data` is the same loader as
// `/x`), fixtures with real ids, and row counts of what the test's users could change.
import { randomBytes } from "node:crypto";
import { matchRoutes, type RouteObject } from "react-router";
import { sql } from "kysely";
import type { Role } from "../../db/schema/core";
import { getDb } from "~/lib/db.server";
import { ensureBuiltInCategories } from "~/lib/catalog/parts.server";
import { createRule } from "~/lib/fit-rules/rules.server";
import { createPackage } from "~/lib/packages/store.server";
import { cookieFor, createTestUser, signedOutRequest, type TestUser } from "./auth";

const routeConfig = (await import("~/routes")).default;

type Module = { loader?: (args: unknown) => unknown; action?: (args: unknown) => unknown };
const modules = import.meta.glob<Module>("../../app/routes/*.{ts,tsx}");

type ConfigEntry = { path?: string; index?: boolean; file: string; children?: ConfigEntry[] };
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

export type RouteInfo = {
  file: string;
  /** the path pattern, e.g. `packages/:id/bench` ("" for the index) */
  pattern: string;
  params: string[];
  hasLoader: boolean;
  hasAction: boolean;
};

/** Every route of app/routes.ts with what its module exports. */
export async function routeTable(): Promise<RouteInfo[]> {
  const flat = (entries: ConfigEntry[], base = ""): { file: string; pattern: string }[] =>
    entries.flatMap((e) => {
      const pattern = e.index ? base : [base, e.path ?? ""].filter(Boolean).join("/");
      return [{ file: e.file, pattern }, ...flat(e.children ?? [], pattern)];
    });
  const out: RouteInfo[] = [];
  for (const r of flat(routeConfig as ConfigEntry[])) {
    const mod = await modules[`../../app/${r.file}`]!();
    out.push({
      ...r,
      params: [...r.pattern.matchAll(/:(\w+)/g)].map((m) => m[1]!),
      hasLoader: typeof mod.loader === "function",
      hasAction: typeof mod.action === "function",
    });
  }
  return out;
}

/** The path for a pattern with these params (each encoded as the browser would). */
export function pathFor(pattern: string, params: Record<string, string>): string {
  return (
    "/" +
    pattern.replace(/:(\w+)/g, (_, name: string) =>
      encodeURIComponent(params[name] ?? "1").replace(/%2E/gi, "."),
    )
  );
}

export type Answer = {
  status: number;
  /** the text a person (or a script) is given: a thrown message, a JSON error, a form error */
  message: string;
  value: unknown;
  headers: Headers | null;
};

/** Matches the path in the real route table and calls the loader (GET) or action. */
export async function dispatch(pending: Request | Promise<Request>): Promise<Answer> {
  const request = await pending;
  const url = new URL(request.url);
  // a `.data` request is the same loader or action, answered as data
  let pathname = url.pathname;
  if (pathname.endsWith(".data")) pathname = pathname.slice(0, -".data".length) || "/";
  if (pathname === "/_root") pathname = "/";
  const matches = matchRoutes(routeObjects, pathname);
  const leaf = matches?.at(-1);
  if (!leaf) throw new Error(`no route matches ${pathname}`);
  const mod = await modules[`../../app/${leaf.route.id}`]!();
  const fn = request.method === "GET" ? mod.loader : mod.action;
  if (!fn) return { status: 405, message: "no handler", value: null, headers: null };
  try {
    return await read(await fn({ request, params: leaf.params, context: {} }));
  } catch (thrown) {
    if (thrown instanceof Response || (thrown && typeof thrown === "object" && "init" in thrown))
      return read(thrown);
    // what the server would answer as 500
    return {
      status: 500,
      message: String((thrown as Error)?.stack ?? thrown),
      value: thrown,
      headers: null,
    };
  }
}

async function read(v: unknown): Promise<Answer> {
  if (v instanceof Response) {
    const text = v.body ? await v.clone().text() : "";
    let message = text;
    if ((v.headers.get("Content-Type") ?? "").includes("json")) {
      try {
        const j = JSON.parse(text) as { error?: string };
        message = typeof j.error === "string" ? j.error : text;
      } catch {
        /* keep the text */
      }
    }
    return { status: v.status, message, value: v, headers: v.headers };
  }
  const d = v as { type?: string; data?: unknown; init?: ResponseInit | null } | null;
  if (d && d.type === "DataWithResponseInit") {
    return {
      status: d.init?.status ?? 200,
      message: messageOf(d.data),
      value: d.data,
      headers: new Headers(d.init?.headers),
    };
  }
  return { status: 200, message: messageOf(v), value: v, headers: null };
}

/** The words in an answer: a string, or every string inside an error object. */
export function messageOf(v: unknown): string {
  if (typeof v === "string") return v;
  if (v === null || v === undefined) return "";
  const words: string[] = [];
  const walk = (x: unknown, depth: number) => {
    if (depth > 6) return;
    if (typeof x === "string") words.push(x);
    else if (Array.isArray(x)) x.forEach((y) => walk(y, depth + 1));
    else if (x && typeof x === "object")
      for (const [k, y] of Object.entries(x)) if (k !== "saved") walk(y, depth + 1);
  };
  walk(v, 0);
  return words.join(" ");
}

export type Fixtures = {
  users: Record<Role, TestUser>;
  cookies: Record<Role, string>;
  packageId: number;
  partId: number;
  ruleId: number;
  bikeId: number;
  customer: { id: number; email: string; phone: string };
  /** a real id for each route param, by route file */
  realParams: (file: string) => Record<string, string>;
  tag: string;
};

export async function makeFixtures(): Promise<Fixtures> {
  const db = getDb();
  const tag = randomBytes(4).toString("hex");
  await ensureBuiltInCategories(db);
  const users = {} as Record<Role, TestUser>;
  const cookies = {} as Record<Role, string>;
  for (const role of ["owner", "builder", "service_writer", "apprentice"] as const) {
    users[role] = await createTestUser(db, role);
    cookies[role] = await cookieFor(users[role]);
  }
  const part = await db
    .insertInto("parts")
    .values({
      part_number: `H-${tag}-CAM`,
      category: "cams",
      maker: "Hostile Test Works",
      name: `Hostile test cam ${tag}`,
      price_cents: 42_000,
      tags: [],
      stock: false,
      attributes: JSON.stringify({}),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const customer = await db
    .insertInto("customers")
    .values({
      name: `Hostile ${tag}`,
      notes: "",
      email: `hostile-${tag}@customer.test`,
      phone: `555-01${parseInt(tag, 16) % 100}-${tag}`,
    })
    .returning(["id", "email", "phone"])
    .executeTakeFirstOrThrow();
  const bike = await db
    .insertInto("bikes")
    .values({ customer_id: customer.id, year: 2021, model: "Test twin", notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const packageId = await createPackage(
    db,
    { name: `Hostile ${tag}`, bikeId: bike.id, isTemplate: false, builderId: users.builder.id },
    users.builder.id,
  );
  const rule = await createRule(
    db,
    {
      name: `Hostile rule ${tag}`,
      kind: "caution",
      condition: "bore_mm > 500",
      message: "Never true in a test",
      upgrade_category: null,
      suggested_part_id: null,
      active: false,
    },
    users.owner.id,
  );
  if (!rule.ok) throw new Error("fixture rule did not compile");
  const ids: Record<string, number> = {
    "routes/packages.$id.tsx": packageId,
    "routes/packages.$id.bench.tsx": packageId,
    "routes/api.packages.$id.ts": packageId,
    "routes/parts.$id.tsx": part.id,
    "routes/rules.$id.tsx": rule.rule.id,
  };
  return {
    users,
    cookies,
    packageId,
    partId: part.id,
    ruleId: rule.rule.id,
    bikeId: bike.id,
    customer: { id: customer.id, email: customer.email!, phone: customer.phone! },
    tag,
    realParams: (file) => {
      const id = ids[file];
      const out: Record<string, string> =
        id === undefined ? { id: "1", token: "not-a-token" } : { id: String(id) };
      return out;
    },
  };
}

/**
 * A request as `role` (or signed out), with our Origin on posts. Signing out ends the
 * session it is sent with, so a post to /logout gets a session of its own.
 */
export function hostileRequest(
  f: Fixtures,
  role: Role | null,
  path: string,
  init: RequestInit = {},
): Request | Promise<Request> {
  const make = (cookie: string | null) => {
    const headers = new Headers(init.headers);
    if (cookie) headers.set("Cookie", cookie);
    return signedOutRequest(path, { ...init, headers });
  };
  if (
    role &&
    (init.method ?? "GET").toUpperCase() !== "GET" &&
    new URL(path, "http://x").pathname.startsWith("/logout")
  )
    return cookieFor(f.users[role]).then(make);
  return make(role ? f.cookies[role] : null);
}

/**
 * Rows the test's own users could have changed: revisions, versions, status changes,
 * packages, invites and preferences they made, and the fixtures' own rows.
 */
export async function rowCounts(f: Fixtures): Promise<Record<string, string | null>> {
  const ids = Object.values(f.users).map((u) => u.id);
  const list = sql.join(ids.map((id) => sql`${id}`));
  const row = await sql<Record<string, string>>`
    select
      (select count(*) from package_revisions where saved_by in (${list}) or package_id = ${f.packageId}) as package_revisions,
      (select count(*) from package_status_changes where changed_by in (${list})) as package_status_changes,
      (select count(*) from packages where created_by in (${list})) as packages,
      (select count(*) from part_versions where changed_by in (${list}) or part_id = ${f.partId}) as part_versions,
      (select count(*) from parts where updated_by in (${list})) as parts,
      (select count(*) from fit_rule_versions where changed_by in (${list}) or rule_id = ${f.ruleId}) as fit_rule_versions,
      (select count(*) from fit_rules where updated_by in (${list})) as fit_rules,
      (select count(*) from auth_tokens where created_by in (${list})) as auth_tokens,
      (select count(*) from users where id in (${list}) and (disabled_at is not null)) as disabled_users,
      (select string_agg(role::text, ',' order by id) from users where id in (${list})) as roles,
      (select count(*) from user_preferences where user_id in (${list})) as user_preferences,
      (select current_revision from packages where id = ${f.packageId}) as package_revision,
      (select version from parts where id = ${f.partId}) as part_version
  `.execute(getDb());
  const out: Record<string, string | null> = {};
  for (const [k, v] of Object.entries(row.rows[0]!)) out[k] = v === null ? null : String(v);
  return out;
}

/** Field values that carry an intent for each kind of action, so posts reach their fields. */
export const INTENTS = [
  "save",
  "status",
  "restore",
  "archive",
  "set-part",
  "set-measured",
  "set-number",
  "clear-slot",
  "revert-measured",
  "set-basis",
  "set-units",
  "invite",
  "role",
  "disable",
  "revoke",
  "preview",
  "import",
  "pair-save",
] as const;
