// The fit-rule engine: compiled conditions cached by rule version, evaluation of a
// package snapshot against the active rules, and the preview of a new or changed rule
// against every saved package.
import { sql, type Kysely } from "kysely";
import type { Database, FitRule, RuleKind } from "../../../db/schema";
import {
  buildScope,
  compileConditionText,
  RuleEvalError,
  type CompiledCondition,
} from "./condition.server";
import type { PackageSnapshot } from "./snapshot";

export { checkCondition, CONDITION_LIMITS, type CheckResult } from "./condition.server";

export type RuleForEval = Pick<
  FitRule,
  | "id"
  | "version"
  | "name"
  | "kind"
  | "condition"
  | "message"
  | "upgrade_category"
  | "suggested_part_id"
>;

export type Finding = {
  ruleId: number;
  ruleVersion: number;
  ruleName: string;
  kind: RuleKind;
  message: string;
  upgradeCategory: string | null;
  suggestedPartId: number | null;
  /** the values of the names the condition used, in this package */
  triggeredBy: Record<string, unknown>;
  /** set when the rule could not be checked against this package */
  error?: string;
};

type CacheEntry = { condition: string; result: ReturnType<typeof compileConditionText> };
const compiled = new Map<string, CacheEntry>();
const MAX_COMPILED = 5000;

/** The compiled condition of one rule version (cached by id and version). */
export function compileCondition(
  rule: Pick<RuleForEval, "id" | "version" | "condition">,
): ReturnType<typeof compileConditionText> {
  const key = `${rule.id}@${rule.version}`;
  const hit = compiled.get(key);
  if (hit && hit.condition === rule.condition) return hit.result;
  const result = compileConditionText(rule.condition);
  if (compiled.size >= MAX_COMPILED) compiled.clear();
  compiled.set(key, { condition: rule.condition, result });
  return result;
}

const KIND_ORDER: Record<RuleKind, number> = { conflict: 0, upgrade: 1, caution: 2 };

function readAll(
  c: CompiledCondition,
  ctx: ReturnType<typeof buildScope>,
): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const r of c.reads) out[r.label] = r.read(ctx);
  return out;
}

function findingOf(
  rule: RuleForEval,
  triggeredBy: Record<string, unknown>,
  error?: string,
): Finding {
  const f: Finding = {
    ruleId: rule.id,
    ruleVersion: rule.version,
    ruleName: rule.name,
    kind: rule.kind,
    message: error ? `Rule could not be checked: ${error}` : rule.message,
    upgradeCategory: rule.upgrade_category,
    suggestedPartId: rule.suggested_part_id,
    triggeredBy,
  };
  if (error) f.error = error;
  return f;
}

type Outcome =
  | { hit: true; triggeredBy: Record<string, unknown> }
  | { hit: false }
  | { hit: "error"; error: string; triggeredBy: Record<string, unknown> };

function evaluateOne(
  rule: RuleForEval,
  c: ReturnType<typeof compileConditionText>,
  ctx: ReturnType<typeof buildScope>,
): Outcome {
  if (!c.ok)
    return { hit: "error", error: `its condition is not valid (${c.message})`, triggeredBy: {} };
  try {
    return c.compiled.test(ctx)
      ? { hit: true, triggeredBy: readAll(c.compiled, ctx) }
      : { hit: false };
  } catch (e) {
    const message =
      e instanceof RuleEvalError
        ? e.message
        : `unexpected error: ${e instanceof Error ? e.message : String(e)}`;
    return { hit: "error", error: message, triggeredBy: readAll(c.compiled, ctx) };
  }
}

/** The findings of `rules` for one package: conflicts first, then upgrades, then cautions. */
export function evaluateRules(snapshot: PackageSnapshot, rules: readonly RuleForEval[]): Finding[] {
  const ctx = buildScope(snapshot);
  const findings: Finding[] = [];
  for (const rule of rules) {
    const o = evaluateOne(rule, compileCondition(rule), ctx);
    if (o.hit === true) findings.push(findingOf(rule, o.triggeredBy));
    else if (o.hit === "error") findings.push(findingOf(rule, o.triggeredBy, o.error));
  }
  return findings.sort(
    (a, b) =>
      KIND_ORDER[a.kind] - KIND_ORDER[b.kind] ||
      Number(Boolean(a.error)) - Number(Boolean(b.error)) ||
      (a.ruleName < b.ruleName ? -1 : a.ruleName > b.ruleName ? 1 : 0) ||
      a.ruleId - b.ruleId,
  );
}

const RULE_COLUMNS = [
  "id",
  "version",
  "name",
  "kind",
  "condition",
  "message",
  "upgrade_category",
  "suggested_part_id",
] as const;

type RulesCache = { fingerprint: string; rules: RuleForEval[] };
const globalCache = globalThis as unknown as { __twRulesCache?: RulesCache };

/**
 * The active rules. One cheap aggregate per call tells whether any rule changed (on
 * any app server) since the cached list was read; only then are the rows loaded again.
 */
export async function loadActiveRules(db: Kysely<Database>): Promise<RuleForEval[]> {
  const fp = await db
    .selectFrom("fit_rules")
    .select([
      sql<string>`count(*)::text`.as("n"),
      sql<string>`coalesce(sum(version), 0)::text`.as("versions"),
      sql<string>`coalesce(max(updated_at), 'epoch')::text`.as("latest"),
      sql<string>`coalesce(max(id), 0)::text`.as("max_id"),
    ])
    .executeTakeFirstOrThrow();
  const fingerprint = `${fp.n}|${fp.versions}|${fp.latest}|${fp.max_id}`;
  const cached = globalCache.__twRulesCache;
  if (cached && cached.fingerprint === fingerprint) return cached.rules;
  const rules = (await db
    .selectFrom("fit_rules")
    .select(RULE_COLUMNS)
    .where("active", "=", true)
    .orderBy("id")
    .execute()) as RuleForEval[];
  for (const r of rules) compileCondition(r);
  globalCache.__twRulesCache = { fingerprint, rules };
  return rules;
}

export type PackageSnapshotRow = { packageId: number; name: string; snapshot: PackageSnapshot };

/** Every saved package's current fit-rule snapshot (the bench stores it on `packages`). */
export async function listPackageSnapshots(db: Kysely<Database>): Promise<PackageSnapshotRow[]> {
  const rows = await db
    .selectFrom("packages")
    .select(["id", "name", "rule_snapshot"])
    .where("status", "<>", "cancelled")
    .orderBy("id")
    .execute();
  const out: PackageSnapshotRow[] = [];
  for (const r of rows) {
    const s = r.rule_snapshot as PackageSnapshot | null;
    if (
      s &&
      typeof s === "object" &&
      typeof s.snapshot_version === "number" &&
      s.numbers &&
      s.slots &&
      Array.isArray(s.words)
    ) {
      out.push({ packageId: r.id, name: r.name, snapshot: s });
    }
  }
  return out;
}

export type CandidateRule = Omit<RuleForEval, "id" | "version"> & { active: boolean };
export type PreviewEntry = {
  packageId: number;
  name: string;
  triggeredBy: Record<string, unknown>;
  error?: string;
};
export type PreviewResult =
  | { ok: false; message: string; index?: number; fragment?: string }
  | {
      ok: true;
      checked: number;
      willFlag: PreviewEntry[];
      stopsFlagging: PreviewEntry[];
      stillFlags: PreviewEntry[];
      cannotCheck: PreviewEntry[];
    };

export type PreviewDeps = {
  listPackageSnapshots: (db: Kysely<Database>) => Promise<PackageSnapshotRow[]>;
};

/**
 * Which saved packages the candidate rule would flag that the saved version does not
 * (willFlag), which the saved version flags and the candidate would not (stopsFlagging),
 * which both flag, and which cannot be checked.
 */
export async function previewRule(
  db: Kysely<Database>,
  candidate: CandidateRule,
  existingRuleId?: number | null,
  deps: PreviewDeps = { listPackageSnapshots },
): Promise<PreviewResult> {
  const next = compileConditionText(candidate.condition);
  if (!next.ok) return next;
  let saved: (RuleForEval & { active: boolean }) | undefined;
  if (existingRuleId) {
    saved = (await db
      .selectFrom("fit_rules")
      .select([...RULE_COLUMNS, "active"])
      .where("id", "=", existingRuleId)
      .executeTakeFirst()) as (RuleForEval & { active: boolean }) | undefined;
  }
  const packages = await deps.listPackageSnapshots(db);
  return previewAgainst(candidate, next.compiled, saved, packages);
}

/** The pure part of previewRule, for callers that already hold the snapshots. */
export function previewAgainst(
  candidate: CandidateRule,
  next: CompiledCondition,
  saved: (RuleForEval & { active: boolean }) | undefined,
  packages: readonly PackageSnapshotRow[],
): Extract<PreviewResult, { ok: true }> {
  const before = saved && saved.active ? compileCondition(saved) : null;
  const candidateRule: RuleForEval = { ...candidate, id: 0, version: 0 };
  const out = {
    ok: true as const,
    checked: packages.length,
    willFlag: [] as PreviewEntry[],
    stopsFlagging: [] as PreviewEntry[],
    stillFlags: [] as PreviewEntry[],
    cannotCheck: [] as PreviewEntry[],
  };
  for (const p of packages) {
    const ctx = buildScope(p.snapshot);
    const now = candidate.active
      ? evaluateOne(candidateRule, { ok: true, compiled: next }, ctx)
      : ({ hit: false } as Outcome);
    const was = before ? evaluateOne(saved!, before, ctx) : ({ hit: false } as Outcome);
    const entry = (o: Outcome): PreviewEntry => {
      const e: PreviewEntry = {
        packageId: p.packageId,
        name: p.name,
        triggeredBy: o.hit === false ? {} : o.triggeredBy,
      };
      if (o.hit === "error") e.error = o.error;
      return e;
    };
    if (now.hit === "error") out.cannotCheck.push(entry(now));
    else if (now.hit && was.hit === true) out.stillFlags.push(entry(now));
    else if (now.hit) out.willFlag.push(entry(now));
    else if (was.hit === true) out.stopsFlagging.push(entry(was));
  }
  return out;
}

// ---- the rule store: every change is a new version row ----

type Db = Kysely<Database>;

/** Runs fn in a transaction, or in the caller's one when db already is a transaction. */
function inTransaction<T>(db: Db, fn: (trx: Db) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db) : db.transaction().execute((trx) => fn(trx));
}

export type RuleFields = Pick<
  FitRule,
  "name" | "kind" | "condition" | "message" | "upgrade_category" | "suggested_part_id" | "active"
>;

/** Rules with the name of whoever changed them last. */
function rulesWithAuthor(db: Db) {
  return db
    .selectFrom("fit_rules")
    .leftJoin("users", "users.id", "fit_rules.updated_by")
    .selectAll("fit_rules")
    .select("users.name as updated_by_name");
}

export async function listRules(db: Db) {
  return rulesWithAuthor(db)
    .orderBy("fit_rules.active", "desc")
    .orderBy("fit_rules.kind")
    .orderBy("fit_rules.name")
    .execute();
}

export async function getRule(db: Db, id: number) {
  if (!Number.isSafeInteger(id) || id <= 0) return undefined;
  return rulesWithAuthor(db).where("fit_rules.id", "=", id).executeTakeFirst();
}

export async function getRuleHistory(db: Db, id: number) {
  return db
    .selectFrom("fit_rule_versions")
    .leftJoin("users", "users.id", "fit_rule_versions.changed_by")
    .selectAll("fit_rule_versions")
    .select("users.name as changed_by_name")
    .where("rule_id", "=", id)
    .orderBy("version", "desc")
    .execute();
}

async function writeRuleVersion(
  db: Db,
  rule: RuleFields & { id: number; version: number },
  note: string,
  userId: number | null,
) {
  await db
    .insertInto("fit_rule_versions")
    .values({
      rule_id: rule.id,
      version: rule.version,
      name: rule.name,
      kind: rule.kind,
      condition: rule.condition,
      message: rule.message,
      upgrade_category: rule.upgrade_category,
      suggested_part_id: rule.suggested_part_id,
      active: rule.active,
      change_note: note,
      changed_by: userId,
    })
    .execute();
}

/** Stores a new rule after its condition passes the checker. */
export async function createRule(
  db: Db,
  fields: RuleFields,
  userId: number | null,
  note = "Created",
) {
  const check = compileConditionText(fields.condition);
  if (!check.ok) return { ok: false as const, check };
  const rule = await inTransaction(db, async (trx) => {
    const row = await trx
      .insertInto("fit_rules")
      .values({ ...fields, updated_by: userId })
      .returningAll()
      .executeTakeFirstOrThrow();
    await writeRuleVersion(trx, row, note, userId);
    return row;
  });
  return { ok: true as const, rule };
}

/** Saves a new version; `stale` when someone saved the rule since `expectedVersion`. */
export async function updateRule(
  db: Db,
  id: number,
  fields: RuleFields,
  expectedVersion: number | null,
  userId: number | null,
  note: string,
) {
  const check = compileConditionText(fields.condition);
  if (!check.ok) return { ok: false as const, check };
  return inTransaction(db, async (trx) => {
    const before = await trx
      .selectFrom("fit_rules")
      .selectAll()
      .where("id", "=", id)
      .forUpdate()
      .executeTakeFirst();
    if (!before) return { ok: false as const, missing: true as const };
    if (expectedVersion !== null && before.version !== expectedVersion)
      return { ok: false as const, stale: before.version };
    const rule = await trx
      .updateTable("fit_rules")
      .set({ ...fields, version: before.version + 1, updated_at: sql`now()`, updated_by: userId })
      .where("id", "=", id)
      .returningAll()
      .executeTakeFirstOrThrow();
    await writeRuleVersion(trx, rule, note || describeRuleChange(before, rule), userId);
    return { ok: true as const, rule };
  });
}

const RULE_FIELD_WORDS: Record<string, string> = {
  upgrade_category: "upgrade category",
  suggested_part_id: "suggested part",
};

export function describeRuleChange(a: Partial<RuleFields>, b: Partial<RuleFields>): string {
  const keys = [
    "name",
    "kind",
    "condition",
    "message",
    "upgrade_category",
    "suggested_part_id",
    "active",
  ] as const;
  const changed = keys.filter((k) => a[k] !== b[k]);
  if (changed.length === 1 && changed[0] === "active")
    return b.active ? "Switched on" : "Switched off";
  return changed.length
    ? `Changed ${changed.map((k) => RULE_FIELD_WORDS[k] ?? k).join(", ")}`
    : "Saved without changes";
}
