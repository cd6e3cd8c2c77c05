// A package's revisions: pick two to compare, each one's change, who saved it and when,
// its findings, and (for those who may edit) restoring an older one.
import { Form } from "react-router";
import { RevisionCompare, type Compare } from "~/components/packages/revision-compare";
import { When } from "~/components/ui/when";

export type RevisionRow = {
  revision: number;
  change: string;
  savedBy: string | null;
  savedAt: string;
  findings: number;
  conflicts: number;
};

export function RevisionList({
  revisions,
  compare,
  compareAsked,
  currentRevision,
  canRestore,
  busy,
}: {
  revisions: RevisionRow[];
  compare: Compare | null;
  compareAsked: boolean;
  currentRevision: number;
  canRestore: boolean;
  busy: boolean;
}) {
  return (
    <section className="rounded border border-steel-200 bg-white p-3">
      <h2 className="font-semibold text-ink">Revisions</h2>
      <Form method="get" className="mt-2 flex flex-wrap items-end gap-2 text-sm">
        <label className="flex flex-col">
          <span className="text-xs text-steel-700">Compare</span>
          <select
            name="a"
            defaultValue={compare?.a.revision ?? Math.max(1, currentRevision - 1)}
            className="rounded border border-steel-300 px-1 py-1"
          >
            {revisions.map((r) => (
              <option key={r.revision} value={r.revision}>
                revision {r.revision}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col">
          <span className="text-xs text-steel-700">with</span>
          <select
            name="b"
            defaultValue={compare?.b.revision ?? currentRevision}
            className="rounded border border-steel-300 px-1 py-1"
          >
            {revisions.map((r) => (
              <option key={r.revision} value={r.revision}>
                revision {r.revision}
              </option>
            ))}
          </select>
        </label>
        <button type="submit" className="rounded bg-ink px-3 py-1 font-semibold text-white">
          Compare
        </button>
      </Form>
      {compare ? (
        <RevisionCompare compare={compare} />
      ) : compareAsked ? (
        <p className="mt-2 text-sm text-red-text">One of those revisions does not exist.</p>
      ) : null}
      <div
        className="mt-3 overflow-x-auto"
        // eslint-disable-next-line jsx-a11y/no-noninteractive-tabindex -- a scrolling region takes focus so a keyboard can scroll it
        tabIndex={0}
        role="region"
        aria-label="Revisions (scrolls sideways on a narrow screen)"
      >
        <table className="w-full min-w-[32rem] text-left text-sm">
          <thead className="text-xs text-steel-700">
            <tr>
              <th className="py-1 pr-2">#</th>
              <th className="pr-2">Change</th>
              <th className="pr-2">Saved</th>
              <th className="pr-2">Findings</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {revisions.map((r) => (
              <tr
                key={r.revision}
                className="border-t border-steel-100"
                data-testid={`revision-${r.revision}`}
              >
                <td className="num py-1 pr-2 align-top">{r.revision}</td>
                <td className="pr-2 align-top">{r.change}</td>
                <td className="num pr-2 align-top text-steel-700">
                  {r.savedBy ?? "—"} · <When at={r.savedAt} time />
                </td>
                <td className="num pr-2 align-top whitespace-nowrap">
                  {r.findings}
                  {r.conflicts ? (
                    <span className="text-red-text"> ({r.conflicts} conflict)</span>
                  ) : null}
                </td>
                <td>
                  {canRestore && r.revision !== currentRevision ? (
                    <Form method="post">
                      <input type="hidden" name="intent" value="restore" />
                      <input type="hidden" name="revision" value={r.revision} />
                      <input type="hidden" name="expectedRevision" value={currentRevision} />
                      <button
                        type="submit"
                        disabled={busy}
                        className="text-xs text-teal-text underline"
                      >
                        Restore
                      </button>
                    </Form>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
