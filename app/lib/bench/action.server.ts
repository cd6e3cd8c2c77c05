// One bench action on the server: parse, apply to the current spec, recompute, check the
// fit rules, save as the next revision — or refuse (400 with field errors, 409 when the
// bench's revision is stale).
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
  toFindingRef,
  FIELD_LABELS,
  type FindingRef,
  type MeasuredField,
  type RuleInfo,
} from "./spec";
import { errorKey, parseBenchIntent, type IntentErrors } from "./intent.server";
import { loadActiveRules, type RuleForEval } from "../fit-rules/rules.server";
import {
  EDITABLE_STATUSES,
  evaluateSpec,
  getBenchState,
  partLabel,
  partMap,
  saveRevision,
  staleDetails,
  type BenchState,
  type PartRow,
  type StaleSave,
} from "../packages/store.server";
import { SLOT_BY_KEY } from "../packages/slots";
import { readMeasured } from "../dyno/measured.server";
import type { PackageStatus } from "../../../db/schema/packages";

/**
 * A saved action's answer: the new revision as the bench shows it, except that findings
 * name their rule versions, and only the rule versions the bench's base revision did not
 * already have come with their name and message (`rules`, by `ruleKey`). The worked steps
 * are built in the browser from the spec.
 */
export type SavedState = Omit<BenchState, "findings"> & {
  findings: FindingRef[];
  rules: Record<string, RuleInfo>;
};

export type BenchActionResult =
  // one JSON string (SavedState): React Router's stream encoding visits every value of an
  // answer, and a saved bench state has hundreds; JSON.stringify is native and one string is one value
  | { ok: true; saved: string }
  | { ok: false; errors: IntentErrors }
  | { ok: false; stale: StaleSave; current: BenchState };

const CALC_FIELD_LABEL: Record<string, string> = {
  ...FIELD_LABELS,
  pistonDomeCc: "Dome / dish (clearance volume)",
};

type ActionRow = {
  current_revision: number;
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
function readForAction(db: Db, packageId: number, extraPartId: number | null) {
  return sql<ActionRow>`
    select p.current_revision, p.spec, p.status, p.findings,
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

// The active rules of the last fingerprint seen. A changed fingerprint reads them again
// (loadActiveRules keeps its own cache, checked by its own query).
let rulesSeen: { fingerprint: string; rules: RuleForEval[] } | null = null;
async function activeRules(db: Db, fingerprint: string): Promise<RuleForEval[]> {
  if (rulesSeen?.fingerprint === fingerprint) return rulesSeen.rules;
  const rules = await loadActiveRules(db);
  rulesSeen = { fingerprint, rules };
  return rules;
}

export async function runBenchAction(db: Db, user: SessionUser, packageId: number, form: FormData) {
  const parsed = parseBenchIntent(form);
  if (!parsed.ok)
    return data<BenchActionResult>({ ok: false, errors: parsed.errors }, { status: 400 });
  const { action, expectedRevision } = parsed;
  const key = errorKey(action as never);

  const row = await readForAction(
    db,
    packageId,
    action.intent === "set-part" ? action.partId : null,
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
  if (row.current_revision !== expectedRevision)
    return staleAnswer(db, packageId, expectedRevision);

  const [rules, measured] = await Promise.all([
    activeRules(db, row.rules_fingerprint),
    readMeasured(db, packageId),
  ]);
  const known = partMap(row.parts, true);
  const before = normaliseSpec(row.spec);
  const next = applyIntent(before, action);
  const ev = await evaluateSpec(db, next, true, rules, known, measured);
  if (action.intent === "set-part") {
    const part = ev.parts.get(action.partId);
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

  // A typed value that makes the engine impossible is refused; parts that do not go
  // together are saved and reported by the fit rules.
  if (action.intent === "set-measured" || action.intent === "set-number") {
    const was = computeBench(toCalcInput(before, resolveFields(before, known))).inputErrors;
    const fresh = ev.computation.inputErrors.filter(
      (e) => !was.some((w) => w.field === e.field && w.message === e.message),
    );
    if (fresh.length > 0) {
      const reasons = fresh.map(
        (e) => `${CALC_FIELD_LABEL[e.field as MeasuredField] ?? e.field} ${e.message}`,
      );
      return data<BenchActionResult>({ ok: false, errors: { [key]: reasons } }, { status: 400 });
    }
  }

  const change = describeIntent(action, partLabel(ev.parts));
  const outcome = await saveRevision(
    db,
    { packageId, expectedRevision, spec: ev.spec, change, userId: user.id },
    ev,
  );
  if (outcome.ok) {
    // the bench already knows the rule versions its base revision's findings hit (a rule
    // that could not be checked showed its error, not its message)
    const had = new Set((row.findings ?? []).filter((f) => f.error === undefined).map(ruleKey));
    const newRules: Record<string, RuleInfo> = {};
    for (const f of ev.findings) {
      if (!had.has(ruleKey(f)))
        newRules[ruleKey(f)] = {
          name: f.ruleName,
          message: f.message,
          upgradeCategory: f.upgradeCategory,
          suggestedPartId: f.suggestedPartId,
        };
    }
    const state: SavedState = {
      packageId,
      revision: outcome.revision,
      spec: ev.spec,
      computation: ev.computation,
      findings: ev.findings.map(toFindingRef),
      rules: newRules,
      parts: [...ev.parts.values()],
      savedBy: user.name,
      savedAt: new Date().toISOString(),
      change,
    };
    return data<BenchActionResult>({ ok: true, saved: JSON.stringify(state) });
  }
  if ("missing" in outcome) throw data("This package does not exist.", { status: 404 });
  return staleAnswer(db, packageId, expectedRevision, outcome);
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
