// Findings in a saved bench answer, one short string each: the kind's letter, the rule
// version's key, and for a rule that could not be checked "!" and why ("c12@3",
// "a40@1!needs power_hp"). A hundred findings are then about a kilobyte, not seven.
import type { FindingRef, RuleKind } from "./spec";

const LETTER: Record<RuleKind, string> = { conflict: "c", upgrade: "u", caution: "a" };
const KIND: Record<string, RuleKind> = { c: "conflict", u: "upgrade", a: "caution" };

export function encodeFinding(f: FindingRef): string {
  const code = `${LETTER[f.kind]}${f.ruleId}@${f.ruleVersion}`;
  return f.error === undefined ? code : `${code}!${f.error}`;
}

export function decodeFinding(code: string): FindingRef {
  const bang = code.indexOf("!");
  const head = bang < 0 ? code : code.slice(0, bang);
  const at = head.indexOf("@");
  const ref: FindingRef = {
    ruleId: Number(head.slice(1, at)),
    ruleVersion: Number(head.slice(at + 1)),
    kind: KIND[head[0]!]!,
  };
  if (bang >= 0) ref.error = code.slice(bang + 1);
  return ref;
}
