// Shown when a save was refused because someone else saved first: what they changed,
// who and when, and the user's own change kept to apply on top.
import { When } from "~/components/ui/when";
import type { StaleInfo } from "~/lib/bench/queue";

export function StaleNotice({
  info,
  mine,
  onApply,
  onDiscard,
}: {
  info: StaleInfo;
  mine: number;
  onApply: () => void;
  onDiscard: () => void;
}) {
  const s = info.stale;
  return (
    <section
      role="alert"
      aria-labelledby="stale-h"
      className="mb-3 rounded border-2 border-amber bg-white p-3 text-sm"
      data-testid="stale-notice"
    >
      <h2 id="stale-h" className="font-semibold text-ink">
        Not saved: this package changed since you opened it
      </h2>
      <p className="mt-1 text-steel-700">
        {s.savedBy ?? "Someone"} saved edit <span className="num">{s.currentVersion}</span> at{" "}
        <When at={s.savedAt} time /> (you were on edit <span className="num">{s.baseVersion}</span>
        ). The bench now shows their version.
      </p>
      {s.changes.length > 0 ? (
        <table className="mt-2 w-full text-left text-sm">
          <thead>
            <tr className="text-xs text-steel-700">
              <th className="py-0.5 font-medium">What changed</th>
              <th className="py-0.5 font-medium">Your base</th>
              <th className="py-0.5 font-medium">Now</th>
            </tr>
          </thead>
          <tbody>
            {s.changes.map((c) => (
              <tr key={c.key} className="border-t border-steel-100">
                <td className="py-0.5">{c.label}</td>
                <td className="num py-0.5">{c.before}</td>
                <td className="num py-0.5 font-semibold">{c.after}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : (
        <p className="mt-1">Last change: {s.change}</p>
      )}
      <div className="mt-2 flex flex-wrap gap-2">
        {mine > 0 ? (
          <button
            type="button"
            onClick={onApply}
            className="rounded bg-teal-dark px-3 py-1 font-semibold text-white hover:bg-ink"
          >
            Apply my change on top
          </button>
        ) : null}
        <button
          type="button"
          onClick={onDiscard}
          className="rounded border border-steel-300 px-3 py-1 font-semibold text-graphite hover:bg-steel-100"
        >
          Keep their version
        </button>
      </div>
    </section>
  );
}
