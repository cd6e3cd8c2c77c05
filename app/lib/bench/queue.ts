// The bench's edits in the browser: each action is shown at once (calc/ on the spec with
// every pending action applied), sent one at a time to the route's action with the
// working copy's version it is based on, and replaced by the server's answer. A stale refusal keeps
// the user's pending actions so they can be applied on top of the newer revision.
import { useEffect, useMemo, useRef, useState } from "react";
import { useFetcher } from "react-router";
import {
  applyIntent,
  computeBench,
  resolveFields,
  ruleInfoOf,
  ruleKey,
  toCalcInput,
  withRuleInfo,
  type BenchFinding,
  type BenchIntent,
  type BenchPart,
  type RuleInfo,
} from "./spec";
import type { BenchActionResult, SavedState } from "./action.server";
import { decodeFinding } from "./finding-codes";
import type { BenchState } from "../packages/store.server";

export interface QueuedAction {
  /** what the action does, for the optimistic figures (null when it cannot be read yet) */
  intent: BenchIntent | null;
  /** the form fields posted to the server */
  fields: Record<string, string>;
  /** where its error is shown */
  key: string;
}

export type StaleInfo = Extract<BenchActionResult, { stale: unknown }>;

/**
 * A saved answer as the bench shows it: its findings with the rule names the base already
 * had, or the answer brought; its parts from the base and the answer.
 */
export function savedToState(saved: SavedState, base: BenchState): BenchState {
  const known = new Map<string, RuleInfo>(
    base.findings
      .filter((f) => f.error === undefined)
      .map((f: BenchFinding) => [ruleKey(f), ruleInfoOf(f)]),
  );
  const { rules, ...rest } = saved;
  // the answer brings only parts the base may lack; the spec's others are the base's
  const inSpec = new Set(Object.values(saved.spec.slots).map((f) => f.partId));
  const parts = new Map([...base.parts, ...saved.parts].map((p) => [p.id, p]));
  return {
    ...rest,
    parts: [...parts.values()].filter((p) => inSpec.has(p.id)),
    findings: saved.findings.map((code) => {
      const f = decodeFinding(code);
      return withRuleInfo(f, rules[ruleKey(f)] ?? known.get(ruleKey(f)));
    }),
  };
}

export function useBenchQueue(initial: BenchState, partsFromLoader: BenchPart[]) {
  const fetcher = useFetcher<BenchActionResult>({ key: `bench-${initial.packageId}` });
  const [base, setBase] = useState<BenchState>(initial);
  const [queue, setQueue] = useState<QueuedAction[]>([]);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [conflict, setConflict] = useState<{ info: StaleInfo; mine: QueuedAction[] } | null>(null);
  const [paused, setPaused] = useState(false);
  const [parts, setParts] = useState<Map<number, BenchPart>>(
    () => new Map([...partsFromLoader, ...initial.parts].map((p) => [p.id, p])),
  );
  const inFlight = useRef<QueuedAction | null>(null);
  const queueRef = useRef(queue);
  queueRef.current = queue;

  const remember = (more: BenchPart[]) =>
    setParts((prev) => {
      if (more.every((p) => prev.has(p.id))) return prev;
      const next = new Map(prev);
      for (const p of more) next.set(p.id, p);
      return next;
    });

  // One effect, so an answer is taken in before the next action is sent: the next one
  // must name the revision the answer brought. The router applies fetcher states in a
  // transition, and a slow render can be overtaken by a quick answer, so the busy state
  // may never be seen: an answer is recognised by its new data, and "no answer" only
  // after the fetcher was seen busy and went idle without any.
  const sawBusy = useRef(false);
  const dataWhenSent = useRef<BenchActionResult | undefined>(undefined);
  useEffect(() => {
    if (inFlight.current && fetcher.state !== "idle") {
      sawBusy.current = true;
      return;
    }
    if (inFlight.current && (fetcher.data !== dataWhenSent.current || sawBusy.current)) {
      const sent = inFlight.current;
      inFlight.current = null;
      sawBusy.current = false;
      const answer = fetcher.data !== dataWhenSent.current ? fetcher.data : undefined;
      if (!answer) {
        setQueue((q) => q.slice(1));
        setErrors((e) => ({
          ...e,
          [sent.key]: ["The server did not answer; the change was not saved. Try again."],
        }));
      } else if (answer.ok) {
        const saved = JSON.parse(answer.saved) as SavedState;
        setBase((b) => savedToState(saved, b));
        remember(saved.parts);
        setErrors((e) => {
          const { [sent.key]: _gone, form: _form, ...rest } = e;
          return rest;
        });
        setQueue((q) => q.slice(1));
      } else if ("stale" in answer) {
        setConflict({ info: answer, mine: queueRef.current });
        setQueue([]);
        setBase(answer.current);
        remember(answer.current.parts);
      } else if (answer.retry) {
        // nothing was saved: the edits stay queued (and on screen) until the user retries
        setErrors((e) => ({ ...e, ...answer.errors }));
        setPaused(true);
      } else {
        setErrors((e) => ({ ...e, ...answer.errors }));
        setQueue((q) => q.slice(1));
      }
      return;
    }
    if (inFlight.current || fetcher.state !== "idle" || queue.length === 0 || conflict || paused)
      return;
    const next = queue[0]!;
    inFlight.current = next;
    sawBusy.current = false;
    dataWhenSent.current = fetcher.data;
    // expectedRevision: the form field that names the working copy's version
    fetcher.submit({ ...next.fields, expectedRevision: String(base.version) }, { method: "post" });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [fetcher.state, fetcher.data, queue, conflict, paused, base.version]);

  const spec = useMemo(
    () => queue.reduce((s, a) => (a.intent ? applyIntent(s, a.intent) : s), base.spec),
    [base.spec, queue],
  );
  const computation = useMemo(
    () =>
      queue.length === 0
        ? base.computation
        : computeBench(toCalcInput(spec, resolveFields(spec, parts), base.limits, parts)),
    [queue.length, base.computation, spec, parts, base.limits],
  );

  return {
    base,
    spec,
    computation,
    parts,
    remember,
    pending: queue.length > 0,
    errors,
    conflict,
    submit(action: QueuedAction) {
      setErrors((e) => {
        const { [action.key]: _gone, ...rest } = e;
        return rest;
      });
      setQueue((q) => [...q, action]);
      setPaused(false);
    },
    /** True while edits wait for the database to be back (see retry). */
    paused,
    /** Sends the edits that were not saved again. */
    retry() {
      setErrors((e) => {
        const { form: _form, ...rest } = e;
        return rest;
      });
      setPaused(false);
    },
    /** Sends the refused actions again, now based on the newer revision. */
    applyMineOnTop() {
      if (!conflict) return;
      setQueue(conflict.mine);
      setConflict(null);
    },
    discardMine() {
      setConflict(null);
    },
    /** The open revision was closed with a note: the next edit opens a new one. */
    revisionClosed(revision: number) {
      setBase((b) => (b.revision === revision ? { ...b, revisionOpen: false } : b));
    },
  };
}
