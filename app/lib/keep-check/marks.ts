// The keep-check's decision for one installed part, from what the server worked out:
// the part the package puts in its slot, the fit-rule findings it causes in this
// package, and its rating against the package's power and torque. Plain data in and
// out, shared by the server and the printable page.
import type { KeepMark } from "../../../db/schema/requests";

export type { KeepMark };

export type ReasonKind = "slot" | "rule" | "rating" | "unknown" | "fine";

export interface Reason {
  kind: ReasonKind;
  mark: KeepMark;
  text: string;
}

export interface RuleHit {
  ruleId: number;
  ruleVersion: number;
  ruleName: string;
  kind: "conflict" | "upgrade" | "caution";
  message: string;
}

export interface PartFacts {
  /** the installed part's catalog id (null: free text) */
  partId: number | null;
  categoryLabel: string;
  /** the bench slot the category fills, if any */
  slotLabel: string | null;
  /** what the package has in that slot (null: the slot is empty) */
  packagePartId: number | null;
  packagePartLabel: string | null;
  /** findings the part causes in the package, with it in its slot */
  hits: RuleHit[];
  ratedHp: number | null;
  ratedTorqueNm: number | null;
  powerHp: number | null;
  torqueNm: number | null;
}

export function decide(f: PartFacts): { mark: KeepMark; reasons: Reason[] } {
  const reasons: Reason[] = [];
  if (f.slotLabel && f.packagePartId !== null && f.packagePartId !== f.partId)
    reasons.push({
      kind: "slot",
      mark: "replace",
      text: `The package puts ${f.packagePartLabel ?? "another part"} in its slot (${f.slotLabel}).`,
    });
  for (const h of f.hits)
    reasons.push({
      kind: "rule",
      mark: h.kind === "caution" ? "review" : "replace",
      text: `Fit rule “${h.ruleName}” ${h.kind === "caution" ? "cautions" : "flags it"} for this package: ${h.message}`,
    });
  if (f.ratedHp !== null && f.powerHp !== null && f.ratedHp < f.powerHp)
    reasons.push({
      kind: "rating",
      mark: "replace",
      text: `Rated for ${f.ratedHp} hp; the package aims at ${f.powerHp} hp.`,
    });
  if (f.ratedTorqueNm !== null && f.torqueNm !== null && f.ratedTorqueNm < f.torqueNm)
    reasons.push({
      kind: "rating",
      mark: "replace",
      text: `Rated for ${f.ratedTorqueNm} N·m; the package makes ${f.torqueNm} N·m.`,
    });
  if (reasons.some((r) => r.mark === "replace")) return { mark: "replace", reasons };
  if (reasons.length) return { mark: "review", reasons };

  const rated = f.ratedHp !== null || f.ratedTorqueNm !== null;
  if (f.partId === null)
    return {
      mark: "review",
      reasons: [
        {
          kind: "unknown",
          mark: "review",
          text: "Not a catalog part: nothing is known about it to check against this package.",
        },
      ],
    };
  if (!f.slotLabel && !rated)
    return {
      mark: "review",
      reasons: [
        {
          kind: "unknown",
          mark: "review",
          text: `No bench slot or rating for ${f.categoryLabel.toLowerCase()}: nothing checks it against this package.`,
        },
      ],
    };
  const fine: Reason[] = [];
  if (f.slotLabel)
    fine.push({
      kind: "fine",
      mark: "keep",
      text:
        f.packagePartId === f.partId
          ? "The package keeps it in its slot, and no fit rule flags it."
          : "The package leaves its slot as it is, and no fit rule flags it.",
    });
  if (f.ratedHp !== null && f.powerHp !== null)
    fine.push({
      kind: "fine",
      mark: "keep",
      text: `Rated for ${f.ratedHp} hp, at or above the package's ${f.powerHp} hp.`,
    });
  if (rated && f.powerHp === null && f.torqueNm === null)
    return {
      mark: "review",
      reasons: [
        {
          kind: "unknown",
          mark: "review",
          text: "The package has no power figure yet to check the part's rating against.",
        },
      ],
    };
  return { mark: "keep", reasons: fine };
}

export const MARK_LABELS: Record<KeepMark, string> = {
  keep: "Keep",
  replace: "Replace",
  review: "Review",
};
