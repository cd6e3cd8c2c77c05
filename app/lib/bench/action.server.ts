// One bench action on the server: parse, apply to the current spec, recompute, check the
// fit rules, save into the working copy and its edit log — or refuse (400 with field
// errors, 409 when the bench's version of the working copy is stale).
import { getCalcLimits } from "../settings/limits.server";
import { sql } from "kysely";
import { data } from "react-router";
import type { Db } from "../db.server";
import type { SessionUser } from "../auth/auth.server";
import {
  applyIntent,
  computeBench,
  describeIntent,
  normaliseSpec,
  resolveFields,
  ruleKey,
  toCalcInput,
  FIELD_LABELS,
  type FindingRef,
  type MeasuredField,
  type RuleInfo,
} from "./spec";
import { errorKey, parseBenchIntent, type IntentErrors } from "./intent.server";
import { loadActiveRules } from "../fit-rules/rules.server";
import { findingRefs, prepareRules, type PreparedRules } from "./findings.server";
import { encodeFinding } from "./finding-codes";
import {
  EDITABLE_STATUSES,
  getBenchState,
  partIds,
  partLabel,
  partMap,
  saveEdit,
  snapshotFor,
  staleDetails,
  type BenchState,
  type PartRow,
  type StaleSave,
} from "../packages/store.server";
import { SLOT_BY_KEY } from "../packages/slots";
import { readMeasured } from "../dyno/measured.server";
import { withMeasured } from "../dyno/measured";
import type { PackageStatus } from "../../../db/schema/packages";

/**
 * A saved action's answer: the new revision as the bench shows it, except that findings
 * name their rule versions, and only the rule versions the bench's base revision did not
 * already have come with their name and message (`rules`, by `ruleKey`). The worked steps
 * are built in the browser from the spec.
 */
export type SavedState = Omit<BenchState, "findings"> & {
  /** the findings as short codes (finding-codes.ts) */
  findings: string[];
  rules: Record<string, RuleInfo>;
};

export type BenchActionResult =
  // one JSON string (SavedState): React Router's stream encoding visits every value of an
  // answer, and a saved bench state has hundreds; JSON.stringify is native and one string is one value
  | { ok: true; saved: string }
  // retry: nothing was read or saved (the database was away); the bench keeps the edit
  | { ok: false; errors: IntentErrors; retry?: true }
  | { ok: false; stale: StaleSave; current: BenchState };

const CALC_FIELD_LABEL: Record<string, string> = {
  ...FIELD_LABELS,
  pistonDomeCc: "Dome / dish (clearance volume)",
};

type ActionRow = {
  version: number;
  spec: unknown;
  status: PackageStatus;
  findings: FindingRef[] | null;
  rules_fingerprint: string;
  parts: PartRow[];
};

/**
 * One round trip for everything the action reads: the package row, the fingerprint of
 * the fit-rules table (any change on any app server moves it), and the parts of the
 * current spec together with the part being put in.
 */
function readForAction(
  db: Db,
  packageId: number,
  extraPartId: number | null,
  knownVersion: number | null,
) {
  return sql<ActionRow>`
    select p.version, p.spec, p.status,
      case when p.version = ${knownVersion}::integer then null else p.findings end as findings,
      (select count(*)::text || '|' || coalesce(sum(version), 0)::text || '|' || coalesce(max(updated_at), 'epoch')::text || '|' || coalesce(max(id), 0)::text
         from fit_rules) as rules_fingerprint,
      (select coalesce(json_agg(t), '[]'::json) from (
         select x.id, x.part_number, x.category, x.maker, x.name, x.tags, x.stock, x.attributes, x.price_cents, x.archived_at
           from parts x
          where x.id = ${extraPartId}
             or x.id in (select (s.value->>'partId')::numeric::integer from jsonb_each(p.spec->'slots') s
                          where jsonb_typeof(s.value->'partId') = 'number')) t) as parts
      from packages p
     where p.id = ${packageId}`
    .execute(db)
    .then((r) => r.rows[0]);
}

// The active rules of the last fingerprint seen, compiled and in findings order. A changed
// fingerprint reads them again (loadActiveRules keeps its own cache, checked by its own query).
let rulesSeen: { fingerprint: string; rules: PreparedRules } | null = null;
async function activeRules(db: Db, fingerprint: string): Promise<PreparedRules> {
  if (rulesSeen?.fingerprint === fingerprint) return rulesSeen.rules;
  const rules = prepareRules(await loadActiveRules(db));
  rulesSeen = { fingerprint, rules };
  return rules;
}

const noTransform = { "Cache-Control": "no-transform" };

// The rule versions the working copy's findings hit, by package, as this process last
// saved them: the next action on that version need not read the findings back.
const findingsSeen = new Map<number, { version: number; keys: Set<string> }>();
const MAX_FINDINGS_SEEN = 5000;
function rememberFindings(packageId: number, version: number, keys: Set<string>) {
  if (findingsSeen.size >= MAX_FINDINGS_SEEN && !findingsSeen.has(packageId)) findingsSeen.clear();
  findingsSeen.set(packageId, { version, keys });
}

export async function runBenchAction(db: Db, user: SessionUser, packageId: number, form: FormData) {
  const parsed = parseBenchIntent(form);
  if (!parsed.ok)
    return data<BenchActionResult>({ ok: false, errors: parsed.errors }, { status: 400 });
  // the form's expectedRevision names the working copy's version the bench is based on
  const { action, expectedRevision: expectedVersion } = parsed;
  const key = errorKey(action as never);

  const seen = findingsSeen.get(packageId);
  const row = await readForAction(
    db,
    packageId,
    action.intent === "set-part" ? action.partId : null,
    seen?.version ?? null,
  );
  if (!row) throw data("This package does not exist.", { status: 404 });
  if (!EDITABLE_STATUSES.includes(row.status)) {
    return data<BenchActionResult>(
      {
        ok: false,
        errors: {
          form: [
            `The package is ${row.status.replace("_", " ")}: its spec is locked. Move it back to draft to change it.`,
          ],
        },
      },
      { status: 400 },
    );
  }
  if (row.version !== expectedVersion) return staleAnswer(db, packageId, expectedVersion);

  const [rules, limits, measured] = await Promise.all([
    activeRules(db, row.rules_fingerprint),
    getCalcLimits(db),
    readMeasured(db, packageId),
  ]);
  const known = partMap(row.parts, true);
  const before = normaliseSpec(row.spec);
  const spec = applyIntent(before, action);
  if (action.intent === "set-part") {
    const part = known.get(action.partId);
    const slot = SLOT_BY_KEY[action.slot]!;
    if (!part || part.archived)
      return data<BenchActionResult>(
        { ok: false, errors: { [key]: ["That part is not in the active catalog."] } },
        { status: 400 },
      );
    if (part.category !== slot.category) {
      return data<BenchActionResult>(
        {
          ok: false,
          errors: {
            [key]: [
              `A ${part.category.replace("_", " ")} part does not go in the ${slot.label.toLowerCase()} slot.`,
            ],
          },
        },
        { status: 400 },
      );
    }
  }
  const computation = computeBench(toCalcInput(spec, resolveFields(spec, known), limits, known));

  // A typed value that makes the engine impossible is refused; parts that do not go
  // together are saved and reported by the fit rules.
  if (action.intent === "set-measured" || action.intent === "set-number") {
    const was = computeBench(
      toCalcInput(before, resolveFields(before, known), limits, known),
    ).inputErrors;
    const fresh = computation.inputErrors.filter(
      (e) => !was.some((w) => w.field === e.field && w.message === e.message),
    );
    if (fresh.length > 0) {
      const reasons = fresh.map(
        (e) => `${CALC_FIELD_LABEL[e.field as MeasuredField] ?? e.field} ${e.message}`,
      );
      return data<BenchActionResult>({ ok: false, errors: { [key]: reasons } }, { status: 400 });
    }
  }

  // the spec's parts (the row brought the base's parts and the one being put in)
  const parts = new Map(
    partIds(spec).flatMap((id) => (known.has(id) ? [[id, known.get(id)!] as const] : [])),
  );
  const snapshot = withMeasured(snapshotFor(spec, parts, computation), measured);
  const findings = findingRefs(snapshot, rules);
  const change = describeIntent(action, partLabel(parts));
  const outcome = await saveEdit(
    db,
    { packageId, expectedVersion, spec, change, userId: user.id, intent: action },
    { spec, computation, snapshot, findings },
  );
  if (outcome.ok) {
    // the bench already knows the rule versions its base's findings hit (a rule that could
    // not be checked showed its error, not its message)
    const had =
      seen && seen.version === row.version
        ? seen.keys
        : new Set((row.findings ?? []).filter((f) => f.error === undefined).map(ruleKey));
    const newRules: Record<string, RuleInfo> = {};
    const keys = new Set<string>();
    for (const f of findings) {
      const k = ruleKey(f);
      if (f.error === undefined) keys.add(k);
      if (!had.has(k)) newRules[k] = rules.byKey.get(k)!.info;
    }
    rememberFindings(packageId, outcome.version, keys);
    const state: SavedState = {
      packageId,
      version: outcome.version,
      revision: outcome.revision,
      revisionOpen: true,
      revisionEdits: outcome.revisionEdits,
      spec,
      computation,
      findings: findings.map(encodeFinding),
      rules: newRules,
      // the bench has its base's parts; only the one put in can be new to it
      parts: action.intent === "set-part" ? [parts.get(action.partId)!] : [],
      limits,
      savedBy: user.name,
      savedAt: new Date().toISOString(),
      change,
    };
    return data<BenchActionResult>(
      { ok: true, saved: JSON.stringify(state) },
      // a few kB answered to the bench's own fetch: compressing it costs more than it saves
      { headers: noTransform },
    );
  }
  if ("missing" in outcome) throw data("This package does not exist.", { status: 404 });
  return staleAnswer(db, packageId, expectedVersion, outcome);
}

async function staleAnswer(db: Db, packageId: number, base: number, known?: StaleSave) {
  const stale = known ?? (await staleOf(db, packageId, base));
  const current = await getBenchState(db, packageId, true);
  if (!current) throw data("This package does not exist.", { status: 404 });
  return data<BenchActionResult>({ ok: false, stale, current }, { status: 409 });
}

async function staleOf(db: Db, packageId: number, base: number): Promise<StaleSave> {
  const outcome = await staleDetails(db, packageId, base);
  if (!outcome.ok && "stale" in outcome && outcome.stale) return outcome;
  throw data("This package does not exist.", { status: 404 });
}
