import { MARK_LABELS, type KeepMark } from "~/lib/keep-check/marks";

const STYLE: Record<KeepMark, string> = {
  keep: "border-green text-green-text",
  replace: "border-red text-red-text",
  review: "border-amber text-amber-text",
};

export function MarkBadge({ mark }: { mark: KeepMark }) {
  return (
    <span
      className={`inline-block min-w-[5.5rem] rounded border-2 bg-white px-2 py-0.5 text-center text-sm font-bold uppercase tracking-wide ${STYLE[mark]}`}
      data-testid="mark"
    >
      {MARK_LABELS[mark]}
    </span>
  );
}
