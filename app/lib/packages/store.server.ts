// Packages and their working copy: reading, creating, and saving bench edits with an
// optimistic-concurrency check on the working copy's version. The server recomputes with
// calc/, builds the fit-rule snapshot, evaluates the shop's rules and saves the edit into
// the working copy and its edit log (revisions: revisions.server.ts).
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { PackageStatus, PowerBasis } from "../../../db/schema/packages";
import { SLOTS, SLOT_BY_KEY } from "./slots";
import {
  computeBench,
  diffSpecs,
  emptySpec,
  normaliseSpec,
  resolveFields,
  ruleKey,
  toCalcInput,
  toFindingRef,
  withRuleInfo,
  type BenchComputation,
  type BenchFinding,
  type BenchPart,
  type BenchSpec,
  type FindingRef,
  type SpecChange,
} from "../bench/spec";
import { buildRuleSnapshot, type PackageSnapshot } from "../fit-rules/snapshot";
import type { CalcLimits } from "../settings/limits";
import { getCalcLimits } from "../settings/limits.server";
import { closeOpenRevision, writeEdit, writeStart, type EditSaved } from "./revisions-log.server";
import {
  evaluateRules,
  loadActiveRules,
  type Finding,
  type RuleForEval,
} from "../fit-rules/rules.server";

export type { Finding };

/** Runs `fn` in a transaction, or in the caller's one when `db` already is one (the seed). */
function inTransaction<T>(db: Db, fn: (trx: Db) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db) : db.transaction().execute((trx) => fn(trx));
}

export { EDITABLE_STATUSES, STATUS_TRANSITIONS } from "../bench/spec";
import { withMeasured, type MeasuredFigure } from "../dyno/measured";
import { STATUS_TRANSITIONS } from "../bench/spec";

type PartRow = {
  id: number;
  part_number: string;
  category: string;
  maker: string;
  name: string;
  tags: string[];
  stock: boolean;
  attributes: Record<string, string | number | boolean | null>;
  price_cents: number;
  archived_at: Date | null;
};

function toBenchPart(r: PartRow, prices: boolean): BenchPart {
  return {
    id: r.id,
    partNumber: r.part_number,
    category: r.category,
    maker: r.maker,
    name: r.name,
    tags: r.tags,
    stock: r.stock,
    attributes: r.attributes,
    ...(prices ? { priceCents: r.price_cents } : {}),
    ...(r.archived_at ? { archived: true } : {}),
  };
}

const PART_COLUMNS = [
  "id",
  "part_number",
  "category",
  "maker",
  "name",
  "tags",
  "stock",
  "attributes",
  "price_cents",
  "archived_at",
] as const;

export async function loadParts(
  db: Db,
  ids: number[],
  prices: boolean,
): Promise<Map<number, BenchPart>> {
  const unique = [...new Set(ids)];
  if (unique.length === 0) return new Map();
  const rows = (await db
    .selectFrom("parts")
    .select(PART_COLUMNS)
    .where("id", "in", unique)
    .execute()) as PartRow[];
  return partMap(rows, prices);
}

/** Part rows (also as read back from json_agg, with the time as text) keyed by id. */
export function partMap(rows: readonly PartRow[], prices: boolean): Map<number, BenchPart> {
  return new Map(rows.map((r) => [r.id, toBenchPart(r, prices)]));
}

export type { PartRow };

/** Active parts, searched by number, maker, name or tag; for the parts shelf. */
export async function searchParts(
  db: Db,
  opts: { q?: string; category?: string; prices: boolean; limit?: number; offset?: number },
): Promise<BenchPart[]> {
  let query = db.selectFrom("parts").select(PART_COLUMNS).where("archived_at", "is", null);
  if (opts.category) query = query.where("category", "=", opts.category);
  const q = opts.q?.trim();
  if (q) {
    const like = `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    query = query.where((eb) =>
      eb.or([
        eb("part_number", "ilike", like),
        eb("name", "ilike", like),
        eb("maker", "ilike", like),
        eb(sql<string>`array_to_string(tags, ' ')`, "ilike", like),
      ]),
    );
  }
  const rows = (await query
    .orderBy("category")
    .orderBy("name")
    .orderBy("id")
    .limit(opts.limit ?? 60)
    .offset(opts.offset ?? 0)
    .execute()) as PartRow[];
  return rows.map((r) => toBenchPart(r, opts.prices));
}

/** Every active part of each slot's category, for the pick-list in each slot. */
export async function slotOptions(db: Db, prices: boolean): Promise<Record<string, BenchPart[]>> {
  const categories = [...new Set(SLOTS.map((s) => s.category))];
  const rows = (await db
    .selectFrom("parts")
    .select(PART_COLUMNS)
    .where("archived_at", "is", null)
    .where("category", "in", categories)
    .orderBy("name")
    .execute()) as PartRow[];
  const out: Record<string, BenchPart[]> = {};
  for (const s of SLOTS)
    out[s.key] = rows.filter((r) => r.category === s.category).map((r) => toBenchPart(r, prices));
  return out;
}

/** What an edit saves: the spec, its figures, its rule snapshot and the rule versions that fire. */
export interface EditEvaluation {
  spec: BenchSpec;
  computation: BenchComputation;
  snapshot: PackageSnapshot;
  findings: readonly FindingRef[];
}

export interface Evaluation {
  spec: BenchSpec;
  computation: BenchComputation;
  snapshot: PackageSnapshot;
  findings: Finding[];
  parts: Map<number, BenchPart>;
  /** The shop's caution limits the computation used. */
  limits: CalcLimits;
}

export function partIds(spec: BenchSpec): number[] {
  return Object.values(spec.slots)
    .map((s) => s.partId)
    .filter((id): id is number => id !== null);
}

/** The fit-rule snapshot of a spec: its numbers (by the rules' names) and its installed parts. */
export function snapshotFor(
  spec: BenchSpec,
  parts: ReadonlyMap<number, BenchPart>,
  c: BenchComputation,
): PackageSnapshot {
  const f = resolveFields(spec, parts);
  const r = c.results;
  const riser = spec.slots.risers?.partId != null ? parts.get(spec.slots.risers.partId) : undefined;
  const riserIn = typeof riser?.attributes.heightIn === "number" ? riser.attributes.heightIn : null;
  return buildRuleSnapshot({
    numbers: {
      power_hp: spec.powerHp,
      power_basis: spec.powerBasis,
      rev_limit_rpm: spec.revLimitRpm,
      bore_mm: f.boreMm.value,
      stroke_mm: f.strokeMm.value,
      displacement_cc: r.displacementCc,
      displacement_ci: r.displacementCi,
      cr_static: r.staticCr,
      cr_dynamic: r.dynamicCr,
      piston_speed_mean_ms: r.meanPistonSpeedMs,
      piston_speed_peak_ms: r.peakPistonSpeedMs,
      quench_mm: r.quenchMm,
      rod_ratio: r.rodRatio,
      deck_mm: spec.deckClearanceMm,
      chamber_cc: f.chamberCc.value,
      dome_cc: f.pistonDomeCc.value,
      gasket_bore_mm: f.gasketBoreMm.value,
      gasket_thickness_mm: f.gasketThicknessMm.value,
      riser_in: riserIn,
    },
    parts: SLOTS.flatMap((s) => {
      const id = spec.slots[s.key]?.partId;
      const p = id != null ? parts.get(id) : undefined;
      if (!p) return [];
      return [
        {
          slot: s.key,
          partId: p.id,
          partNumber: p.partNumber,
          category: p.category,
          tags: p.tags,
          attributes: p.attributes,
          stock: p.stock,
        },
      ];
    }),
  });
}

/**
 * Recomputes a spec with calc/, builds its snapshot and evaluates the active fit rules.
 * `known` may hold parts already read (a superset of the spec's is fine); they are not read again.
 */
export async function evaluateSpec(
  db: Db,
  raw: unknown,
  prices = true,
  activeRules?: RuleForEval[],
  known?: ReadonlyMap<number, BenchPart>,
  /** the dyno's measured figure, when the package has one (app/lib/dyno/measured.ts) */
  measured?: MeasuredFigure | null,
): Promise<Evaluation> {
  const spec = normaliseSpec(raw);
  const ids = partIds(spec);
  const [loaded, rules, limits] = await Promise.all([
    known ? undefined : loadParts(db, ids, prices),
    activeRules ?? loadActiveRules(db),
    getCalcLimits(db),
  ]);
  const parts =
    loaded ??
    new Map(ids.flatMap((id) => (known!.has(id) ? [[id, known!.get(id)!] as const] : [])));
  const computation = computeBench(toCalcInput(spec, resolveFields(spec, parts), limits, parts));
  const snapshot = withMeasured(snapshotFor(spec, parts, computation), measured);
  const findings = await evaluateRules(snapshot, rules);
  return { spec, computation, snapshot, findings, parts, limits };
}

export interface PackageHeader {
  id: number;
  name: string;
  status: PackageStatus;
  isTemplate: boolean;
  bikeId: number | null;
  bikeLabel: string | null;
  customerId: number | null;
  customerName: string | null;
  builderId: number | null;
  builderName: string | null;
  notes: string;
  revision: number;
  /** the working copy's version (what a restore names as its base) */
  version: number;
  updatedAt: string;
  copiedFromId: number | null;
}

function headerQuery(db: Db) {
  return db
    .selectFrom("packages as p")
    .leftJoin("bikes as b", "b.id", "p.bike_id")
    .leftJoin("customers as c", "c.id", "b.customer_id")
    .leftJoin("users as u", "u.id", "p.builder_id")
    .select([
      "p.id",
      "p.name",
      "p.status",
      "p.is_template",
      "p.bike_id",
      "b.year as bike_year",
      "b.model as bike_model",
      "c.id as customer_id",
      "c.name as customer_name",
      "p.builder_id",
      "u.name as builder_name",
      "p.notes",
      "p.current_revision",
      "p.version",
      "p.updated_at",
      "p.copied_from_id",
      "p.power_hp",
      "p.power_basis",
      "p.rev_limit_rpm",
    ]);
}

type HeaderRow = Awaited<ReturnType<ReturnType<typeof headerQuery>["executeTakeFirstOrThrow"]>>;

function toHeader(r: HeaderRow): PackageHeader {
  return {
    id: r.id,
    name: r.name,
    status: r.status,
    isTemplate: r.is_template,
    bikeId: r.bike_id,
    bikeLabel: r.bike_year ? `${r.bike_year} ${r.bike_model}` : null,
    customerId: r.customer_id,
    customerName: r.customer_name,
    builderId: r.builder_id,
    builderName: r.builder_name,
    notes: r.notes,
    revision: r.current_revision,
    version: r.version,
    updatedAt: new Date(r.updated_at).toISOString(),
    copiedFromId: r.copied_from_id,
  };
}

export async function getPackageHeader(db: Db, id: number): Promise<PackageHeader | null> {
  const row = await headerQuery(db).where("p.id", "=", id).executeTakeFirst();
  return row ? toHeader(row) : null;
}

/** What the bench and the JSON API show of a package's working copy. */
export interface BenchState {
  packageId: number;
  /** the working copy's version: the next edit names it (stale-save token) */
  version: number;
  /** the package's latest revision, open (holding the latest edits) or closed */
  revision: number;
  revisionOpen: boolean;
  /** how many edits the latest revision holds */
  revisionEdits: number;
  spec: BenchSpec;
  computation: BenchComputation;
  findings: BenchFinding[];
  parts: BenchPart[];
  /** The shop's caution limits, for the browser's figures before the server answers. */
  limits: CalcLimits;
  /** who made the latest edit, when, and what it changed */
  savedBy: string | null;
  savedAt: string;
  change: string;
}

/**
 * A revision's stored findings with each rule version's name and message joined in.
 * With the revision's rule snapshot, each finding also gets the values its condition
 * used, by evaluating that (unchanging) rule version on the snapshot again. Revisions
 * saved before findings were stored by reference already carry everything.
 */
export async function readFindings(
  db: Db,
  stored: unknown,
  snapshot?: PackageSnapshot,
): Promise<BenchFinding[]> {
  const list = Array.isArray(stored) ? (stored as (FindingRef | Finding)[]) : [];
  const refs = list.filter((f) => !("ruleName" in f));
  if (refs.length === 0) return list as BenchFinding[];
  const versions = await db
    .selectFrom("fit_rule_versions")
    .select([
      "rule_id",
      "version",
      "name",
      "kind",
      "condition",
      "message",
      "upgrade_category",
      "suggested_part_id",
    ])
    .where("rule_id", "in", [...new Set(refs.map((f) => f.ruleId))])
    .execute();
  const wanted = new Set(refs.map(ruleKey));
  const rules: RuleForEval[] = versions
    .filter((v) => wanted.has(`${v.rule_id}@${v.version}`))
    .map((v) => ({
      id: v.rule_id,
      version: v.version,
      name: v.name,
      kind: v.kind,
      condition: v.condition,
      message: v.message,
      upgrade_category: v.upgrade_category,
      suggested_part_id: v.suggested_part_id,
    }));
  const byKey = new Map(rules.map((r) => [`${r.id}@${r.version}`, r]));
  const again = snapshot
    ? new Map(evaluateRules(snapshot, rules).map((f) => [ruleKey(f), f.triggeredBy]))
    : null;
  return list.map((f) => {
    if ("ruleName" in f) return f;
    const r = byKey.get(ruleKey(f));
    const out = withRuleInfo(
      f,
      r && {
        name: r.name,
        message: r.message,
        upgradeCategory: r.upgrade_category,
        suggestedPartId: r.suggested_part_id,
      },
    );
    return again ? { ...out, triggeredBy: again.get(ruleKey(f)) ?? {} } : out;
  });
}

/** Findings as a revision stores them: by rule version (see FindingRef). */
export function storedFindings(findings: readonly FindingRef[]): string {
  return JSON.stringify(findings.map(toFindingRef));
}

export async function getBenchState(
  db: Db,
  id: number,
  prices: boolean,
  opts: { triggeredBy?: boolean } = {},
): Promise<BenchState | null> {
  const row = await db
    .selectFrom("packages as p")
    .leftJoin("package_edits as e", (j) =>
      j.onRef("e.package_id", "=", "p.id").onRef("e.version", "=", "p.version"),
    )
    .leftJoin("package_revisions as r", (j) =>
      j.onRef("r.package_id", "=", "p.id").onRef("r.revision", "=", "p.current_revision"),
    )
    .leftJoin("users as u", "u.id", "e.user_id")
    .select((eb) => [
      "p.id",
      "p.version",
      "p.current_revision",
      "p.spec",
      "p.results",
      "p.findings",
      "p.updated_at",
      "e.change",
      "e.at",
      "u.name as saved_by_name",
      "r.closed_at",
      eb
        .selectFrom("package_edits as x")
        .select((x) => x.fn.countAll<number>().as("n"))
        .whereRef("x.package_id", "=", "p.id")
        .whereRef("x.revision", "=", "p.current_revision")
        .as("revision_edits"),
    ])
    .$if(opts.triggeredBy === true, (q) => q.select("p.rule_snapshot"))
    .where("p.id", "=", id)
    .executeTakeFirst();
  if (!row) return null;
  const spec = normaliseSpec(row.spec);
  const snapshot = "rule_snapshot" in row ? (row.rule_snapshot as PackageSnapshot) : undefined;
  const [parts, findings, limits] = await Promise.all([
    loadParts(db, partIds(spec), prices),
    readFindings(db, row.findings, snapshot),
    getCalcLimits(db),
  ]);
  // computed again (a few microseconds): the cautions and the dynamic ratio's lift basis
  // follow the shop's limits of today, which may have changed since the save
  const computation = computeBench(toCalcInput(spec, resolveFields(spec, parts), limits, parts));
  return {
    packageId: row.id,
    version: row.version,
    revision: row.current_revision,
    revisionOpen: row.closed_at === null,
    revisionEdits: Number(row.revision_edits ?? 0),
    spec,
    computation,
    findings,
    parts: [...parts.values()],
    limits,
    savedBy: row.saved_by_name,
    savedAt: new Date(row.at ?? row.updated_at).toISOString(),
    change: row.change ?? "",
  };
}

function syncColumns(spec: BenchSpec) {
  return {
    rev_limit_rpm: spec.revLimitRpm,
    power_hp: spec.powerHp,
    power_basis: spec.powerBasis as PowerBasis | null,
  };
}

export interface NewPackageInput {
  name: string;
  bikeId: number | null;
  isTemplate: boolean;
  builderId: number | null;
  notes?: string;
  spec?: unknown;
  copiedFromId?: number | null;
  change?: string;
}

export async function createPackage(
  db: Db,
  input: NewPackageInput,
  userId: number | null,
): Promise<number> {
  const ev = await evaluateSpec(db, input.spec ?? emptySpec());
  return inTransaction(db, async (trx) => {
    const { id } = await trx
      .insertInto("packages")
      .values({
        name: input.name,
        bike_id: input.isTemplate ? null : input.bikeId,
        is_template: input.isTemplate,
        builder_id: input.builderId,
        notes: input.notes ?? "",
        copied_from_id: input.copiedFromId ?? null,
        current_revision: 1,
        spec: JSON.stringify(ev.spec),
        results: JSON.stringify(ev.computation),
        rule_snapshot: JSON.stringify(ev.snapshot),
        findings: storedFindings(ev.findings),
        created_by: userId,
        ...syncColumns(ev.spec),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await writeStart(trx, id, userId, input.change ?? "Package started", JSON.stringify(ev.spec));
    await trx
      .insertInto("package_status_changes")
      .values({ package_id: id, from_status: null, to_status: "draft", changed_by: userId })
      .execute();
    return id;
  });
}

export interface StaleSave {
  ok: false;
  stale: true;
  currentVersion: number;
  baseVersion: number;
  changes: SpecChange[];
  savedBy: string | null;
  savedAt: string;
  change: string;
}

export type SaveOutcome =
  ({ ok: true } & EditSaved) | StaleSave | { ok: false; stale: false; missing: true };

export function partLabel(parts: ReadonlyMap<number, BenchPart>) {
  return (id: number) => {
    const p = parts.get(id);
    return p ? `${p.partNumber} ${p.name}` : `part #${id}`;
  };
}

/**
 * Saves a spec as the next edit of the working copy, only when it is still at
 * `expectedVersion` (one conditional update: of two concurrent saves on the same base, one
 * wins), with one row in the edit log; the edit joins or opens a revision (see writeEdit).
 */
export async function saveEdit(
  db: Db,
  input: {
    packageId: number;
    expectedVersion: number;
    spec: BenchSpec;
    change: string;
    userId: number;
    intent?: unknown;
  },
  evaluation?: EditEvaluation,
): Promise<SaveOutcome> {
  const ev = evaluation ?? (await evaluateSpec(db, input.spec));
  const sync = syncColumns(ev.spec);
  const saved = await writeEdit(db, {
    packageId: input.packageId,
    expectedVersion: input.expectedVersion,
    userId: input.userId,
    change: input.change,
    intent: input.intent ?? null,
    spec: JSON.stringify(ev.spec),
    results: JSON.stringify(ev.computation),
    ruleSnapshot: JSON.stringify(ev.snapshot),
    findings: storedFindings(ev.findings),
    revLimitRpm: sync.rev_limit_rpm,
    powerHp: sync.power_hp,
    powerBasis: sync.power_basis,
  });
  if (saved) return { ok: true, ...saved };
  return staleDetails(db, input.packageId, input.expectedVersion);
}

/** Why a save on `baseVersion` is stale: what changed since, who made the latest edit and when. */
export async function staleDetails(
  db: Db,
  packageId: number,
  baseVersion: number,
): Promise<SaveOutcome> {
  const current = await db
    .selectFrom("packages as p")
    .leftJoin("package_edits as e", (j) =>
      j.onRef("e.package_id", "=", "p.id").onRef("e.version", "=", "p.version"),
    )
    .leftJoin("users as u", "u.id", "e.user_id")
    .select(["p.version", "p.spec", "e.change", "e.at", "p.updated_at", "u.name as saved_by_name"])
    .where("p.id", "=", packageId)
    .executeTakeFirst();
  if (!current) return { ok: false, stale: false, missing: true };
  const base = await db
    .selectFrom("package_edits")
    .select("spec")
    .where("package_id", "=", packageId)
    .where("version", "=", baseVersion)
    .executeTakeFirst();
  const a = normaliseSpec(base?.spec);
  const b = normaliseSpec(current.spec);
  const parts = await loadParts(db, [...partIds(a), ...partIds(b)], false);
  return {
    ok: false,
    stale: true,
    currentVersion: current.version,
    baseVersion,
    changes: diffSpecs(a, b, partLabel(parts)),
    savedBy: current.saved_by_name,
    savedAt: new Date(current.at ?? current.updated_at).toISOString(),
    change: current.change ?? "",
  };
}

export const RESULT_ROWS: {
  key: keyof BenchComputation["results"];
  label: string;
  unit: string;
  digits: number;
}[] = [
  { key: "displacementCc", label: "Displacement", unit: "cc", digits: 0 },
  { key: "displacementCi", label: "Displacement", unit: "ci", digits: 1 },
  { key: "staticCr", label: "Static compression", unit: ":1", digits: 2 },
  { key: "dynamicCr", label: "Dynamic compression", unit: ":1", digits: 2 },
  { key: "meanPistonSpeedMs", label: "Mean piston speed", unit: "m/s", digits: 1 },
  { key: "peakPistonSpeedMs", label: "Peak piston speed", unit: "m/s", digits: 1 },
  { key: "quenchMm", label: "Quench", unit: "mm", digits: 2 },
  { key: "rodRatio", label: "Rod ratio", unit: "", digits: 3 },
  { key: "boreStrokeRatio", label: "Bore/stroke", unit: "", digits: 3 },
];

export async function changeStatus(
  db: Db,
  packageId: number,
  to: PackageStatus,
  userId: number,
): Promise<{ ok: true } | { ok: false; message: string }> {
  return inTransaction(db, async (trx) => {
    const row = await trx
      .selectFrom("packages")
      .select(["status", "is_template"])
      .where("id", "=", packageId)
      .forUpdate()
      .executeTakeFirst();
    if (!row) return { ok: false, message: "This package no longer exists." };
    if (row.is_template)
      return {
        ok: false,
        message: "A shop template has no status of its own; copy it into a package for a bike.",
      };
    if (!STATUS_TRANSITIONS[row.status].includes(to)) {
      return {
        ok: false,
        message: `A package that is ${row.status.replace("_", " ")} cannot move to ${to.replace("_", " ")}.`,
      };
    }
    await trx
      .updateTable("packages")
      .set({ status: to, updated_at: sql`now()` })
      .where("id", "=", packageId)
      .execute();
    await trx
      .insertInto("package_status_changes")
      .values({ package_id: packageId, from_status: row.status, to_status: to, changed_by: userId })
      .execute();
    // a revision never spans a status change
    await closeOpenRevision(trx, packageId, "status", userId);
    return { ok: true };
  });
}

export async function listStatusChanges(db: Db, packageId: number) {
  const rows = await db
    .selectFrom("package_status_changes as s")
    .leftJoin("users as u", "u.id", "s.changed_by")
    .select(["s.from_status", "s.to_status", "s.changed_at", "u.name"])
    .where("s.package_id", "=", packageId)
    .orderBy("s.id", "desc")
    .execute();
  return rows.map((r) => ({
    from: r.from_status,
    to: r.to_status,
    at: new Date(r.changed_at).toISOString(),
    by: r.name,
  }));
}

export const PAGE_SIZE = 20;
export const SORTS = {
  updated: "p.updated_at",
  name: "p.name",
  status: "p.status",
  customer: "c.name",
} as const;
export type SortKey = keyof typeof SORTS;

export interface PackageFilters {
  status?: PackageStatus | "template" | null;
  customerId?: number | null;
  builderId?: number | null;
  sort?: SortKey;
  dir?: "asc" | "desc";
  page?: number;
}

export async function listPackages(db: Db, f: PackageFilters) {
  let q = headerQuery(db);
  if (f.status === "template") q = q.where("p.is_template", "=", true);
  else if (f.status) q = q.where("p.status", "=", f.status).where("p.is_template", "=", false);
  if (f.customerId) q = q.where("c.id", "=", f.customerId);
  if (f.builderId) q = q.where("p.builder_id", "=", f.builderId);
  const countRow = await q
    .clearSelect()
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirst();
  const total = Number(countRow?.n ?? 0);
  const page = Math.max(1, f.page ?? 1);
  const rows = await q
    .orderBy(
      sql.ref(SORTS[f.sort ?? "updated"]),
      f.dir ?? (f.sort && f.sort !== "updated" ? "asc" : "desc"),
    )
    .orderBy("p.id", "desc")
    .limit(PAGE_SIZE)
    .offset((page - 1) * PAGE_SIZE)
    .execute();
  return {
    total,
    page,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    rows: rows.map((r) => ({
      ...toHeader(r),
      powerHp: r.power_hp,
      powerBasis: r.power_basis,
      revLimitRpm: r.rev_limit_rpm,
    })),
  };
}

export function slotLabel(key: string): string {
  return SLOT_BY_KEY[key]?.label ?? key;
}
