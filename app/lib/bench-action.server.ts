// One bench action on the server: parse, apply to the current spec, recompute, check the
// fit rules, save as the next revision — or refuse (400 with field errors, 409 when the
// bench's revision is stale).
import { data } from "react-router";
import type { Db } from "./db.server";
import type { SessionUser } from "./auth.server";
import { applyIntent, computeBench, describeIntent, normaliseSpec, resolveFields, toCalcInput, FIELD_LABELS, type MeasuredField } from "./bench";
import { errorKey, parseBenchIntent, type IntentErrors } from "./bench-intent.server";
import { loadActiveRules } from "./fit-rules.server";
import { EDITABLE_STATUSES, evaluateSpec, getBenchState, partLabel, saveRevision, staleDetails, type BenchState, type StaleSave } from "./packages.server";
import { SLOT_BY_KEY } from "./slots";

export type BenchActionResult =
  | { ok: true; state: BenchState }
  | { ok: false; errors: IntentErrors }
  | { ok: false; stale: StaleSave; current: BenchState };

const CALC_FIELD_LABEL: Record<string, string> = { ...FIELD_LABELS, pistonDomeCc: "Dome / dish (clearance volume)" };

export async function runBenchAction(db: Db, user: SessionUser, packageId: number, form: FormData) {
  const parsed = parseBenchIntent(form);
  if (!parsed.ok) return data<BenchActionResult>({ ok: false, errors: parsed.errors }, { status: 400 });
  const { action, expectedRevision } = parsed;
  const key = errorKey(action as never);

  // the package row and the active rules in parallel: one round trip's wait, not two
  const [row, rules] = await Promise.all([
    db.selectFrom("packages").select(["current_revision", "spec", "status"]).where("id", "=", packageId).executeTakeFirst(),
    loadActiveRules(db),
  ]);
  if (!row) throw data("This package does not exist.", { status: 404 });
  if (!EDITABLE_STATUSES.includes(row.status)) {
    return data<BenchActionResult>(
      { ok: false, errors: { form: [`The package is ${row.status.replace("_", " ")}: its spec is locked. Move it back to draft to change it.`] } },
      { status: 400 },
    );
  }
  if (row.current_revision !== expectedRevision) return staleAnswer(db, packageId, expectedRevision);

  const before = normaliseSpec(row.spec);
  const next = applyIntent(before, action);
  // the new part arrives with the spec's other parts; it is checked before anything is saved
  const ev = await evaluateSpec(db, next, true, rules);
  if (action.intent === "set-part") {
    const part = ev.parts.get(action.partId);
    const slot = SLOT_BY_KEY[action.slot]!;
    if (!part || part.archived) return data<BenchActionResult>({ ok: false, errors: { [key]: ["That part is not in the active catalog."] } }, { status: 400 });
    if (part.category !== slot.category) {
      return data<BenchActionResult>({ ok: false, errors: { [key]: [`A ${part.category.replace("_", " ")} part does not go in the ${slot.label.toLowerCase()} slot.`] } }, { status: 400 });
    }
  }

  // A typed value that makes the engine impossible is refused; parts that do not go
  // together are saved and reported by the fit rules.
  if (action.intent === "set-measured" || action.intent === "set-number") {
    const was = computeBench(toCalcInput(before, resolveFields(before, ev.parts))).inputErrors;
    const fresh = ev.computation.inputErrors.filter((e) => !was.some((w) => w.field === e.field && w.message === e.message));
    if (fresh.length > 0) {
      const reasons = fresh.map((e) => `${CALC_FIELD_LABEL[e.field as MeasuredField] ?? e.field} ${e.message}`);
      return data<BenchActionResult>({ ok: false, errors: { [key]: reasons } }, { status: 400 });
    }
  }

  const outcome = await saveRevision(db, { packageId, expectedRevision, spec: ev.spec, change: describeIntent(action, partLabel(ev.parts)), userId: user.id }, ev);
  if (outcome.ok) {
    const state: BenchState = {
      packageId,
      revision: outcome.revision,
      spec: ev.spec,
      computation: ev.computation,
      findings: ev.findings,
      parts: [...ev.parts.values()],
      savedBy: user.name,
      savedAt: new Date().toISOString(),
      change: describeIntent(action, partLabel(ev.parts)),
    };
    return data<BenchActionResult>({ ok: true, state });
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
