// A package's revisions, newest first: each with its note (or what it started with), who
// worked in it and how it closed, and folded under it the edits it holds. Compare and
// restore work on a revision and on any single edit.
import { Form, Link } from "react-router";
import type { RevisionSummary } from "~/lib/packages/revisions.server";
import { CLOSE_REASON_TEXT, pickKey, type StatePick } from "~/lib/packages/revisions";
import { RevisionCompare, type Compare } from "./revision-compare";

const when = (iso: string) => new Date(iso).toLocaleString();

function RestoreButton({
  target,
  version,
  busy,
  label,
}: {
  target: string;
  version: number;
  busy: boolean;
  label: string;
}) {
  return (
    <Form method="post" className="inline">
      <input type="hidden" name="intent" value="restore" />
      <input type="hidden" name="target" value={target} />
      <input type="hidden" name="expectedVersion" value={version} />
      <button
        type="submit"
        disabled={busy}
        aria-label={label}
        className="text-xs text-teal-text underline"
      >
        Restore
      </button>
    </Form>
  );
}

export function RevisionList({
  packageId,
  revisions,
  version,
  canEdit,
  busy,
  compare,
  compareAsked,
}: {
  packageId: number;
  revisions: RevisionSummary[];
  /** the working copy's version */
  version: number;
  canEdit: boolean;
  busy: boolean;
  compare: Compare | null;
  compareAsked: boolean;
}) {
  const link = (a: StatePick, b: StatePick) =>
    `/packages/${packageId}?a=${pickKey(a)}&b=${pickKey(b)}#compare`;
  const latest = revisions[0];
  return (
    <section id="revisions" className="rounded border border-steel-200 bg-white p-3">
      <h2 className="font-semibold text-ink">Revisions</h2>
      <Form method="get" className="mt-2 flex flex-wrap items-end gap-2 text-sm">
        {(["a", "b"] as const).map((side) => (
          <label key={side} className="flex flex-col">
            <span className="text-xs text-steel-700">{side === "a" ? "Compare" : "with"}</span>
            <select
              name={side}
              defaultValue={
                compare
                  ? pickKey(compare[side])
                  : side === "a"
                    ? `r${Math.max(1, (latest?.revision ?? 2) - 1)}`
                    : `r${latest?.revision ?? 1}`
              }
              className="max-w-[18rem] rounded border border-steel-300 px-1 py-1"
            >
              {revisions.map((r) => (
                <optgroup key={r.revision} label={`Revision ${r.revision}`}>
                  <option value={`r${r.revision}`}>
                    revision {r.revision}
                    {r.note ? ` · ${r.note}` : ""}
                  </option>
                  {r.edits.length > 1 || r.closeReason !== "saved"
                    ? r.edits.map((e) => (
                        <option key={e.version} value={`e${e.version}`}>
                          edit {e.version} · {e.change}
                        </option>
                      ))
                    : null}
                </optgroup>
              ))}
            </select>
          </label>
        ))}
        <button type="submit" className="rounded bg-ink px-3 py-1 font-semibold text-white">
          Compare
        </button>
      </Form>
      <div id="compare">
        {compare ? (
          <RevisionCompare compare={compare} />
        ) : compareAsked ? (
          <p className="mt-2 text-sm text-red-text">
            One of those revisions or edits does not exist.
          </p>
        ) : null}
      </div>
      <ol className="mt-3 flex flex-col gap-2" aria-label="Revisions, newest first">
        {revisions.map((r, i) => {
          const previous = revisions[i + 1];
          const open = r.closedAt === null;
          const isCurrent = r.lastVersion === version;
          return (
            <li
              key={r.revision}
              data-testid={`revision-${r.revision}`}
              className={`rounded border p-2 text-sm ${open ? "border-teal" : "border-steel-200"}`}
            >
              <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
                <span className="num font-semibold text-ink">Revision {r.revision}</span>
                <span
                  className={`rounded px-1.5 text-xs ${open ? "bg-teal-dark text-white" : "bg-steel-100 text-steel-700"}`}
                >
                  {open ? "open" : CLOSE_REASON_TEXT[r.closeReason ?? "saved"]}
                </span>
                {r.note ? (
                  <span className="font-semibold" data-testid="revision-note">
                    “{r.note}”
                  </span>
                ) : (
                  <span>{r.change}</span>
                )}
                <span className="ml-auto flex gap-3">
                  {previous ? (
                    <Link
                      to={link(
                        { kind: "revision", number: previous.revision },
                        { kind: "revision", number: r.revision },
                      )}
                      className="text-xs text-teal-text underline"
                    >
                      Compare with revision {previous.revision}
                    </Link>
                  ) : null}
                  {canEdit && !isCurrent ? (
                    <RestoreButton
                      target={`r${r.revision}`}
                      version={version}
                      busy={busy}
                      label={`Restore revision ${r.revision}`}
                    />
                  ) : null}
                </span>
              </div>
              <p className="num mt-0.5 text-xs text-steel-700">
                {r.editor ?? "—"} · {when(r.openedAt)}
                {r.closedAt ? ` → ${when(r.closedAt)}` : " · open"}
                {r.closedBy && r.closeReason !== "note" ? ` (by ${r.closedBy})` : ""}
                {r.quietAt ? ` · closes after ${when(r.quietAt)} without edits` : ""} · {r.findings}{" "}
                findings
                {r.conflicts ? (
                  <span className="text-red-text"> ({r.conflicts} conflict)</span>
                ) : null}
              </p>
              {r.edits.length > 0 ? (
                <details className="mt-1" open={open}>
                  <summary className="cursor-pointer text-xs font-semibold text-steel-700">
                    {r.edits.length} {r.edits.length === 1 ? "edit" : "edits"}
                  </summary>
                  <ol className="mt-1 border-l-2 border-steel-200 pl-2">
                    {r.edits.map((e) => (
                      <li
                        key={e.version}
                        data-testid={`edit-${e.version}`}
                        className="flex flex-wrap items-baseline gap-x-3 border-t border-steel-100 py-0.5 first:border-t-0"
                      >
                        <span className="num text-xs text-steel-700">edit {e.version}</span>
                        <span>{e.change}</span>
                        <span className="num text-xs text-steel-700">
                          {e.by ?? "—"} · {when(e.at)}
                        </span>
                        <span className="ml-auto flex gap-3">
                          {e.version > 1 ? (
                            <Link
                              to={link(
                                { kind: "edit", number: e.version - 1 },
                                { kind: "edit", number: e.version },
                              )}
                              className="text-xs text-teal-text underline"
                              aria-label={`Compare edit ${e.version} with the one before`}
                            >
                              Compare with the edit before
                            </Link>
                          ) : null}
                          {canEdit && e.version !== version ? (
                            <RestoreButton
                              target={`e${e.version}`}
                              version={version}
                              busy={busy}
                              label={`Restore the package as it was after edit ${e.version}`}
                            />
                          ) : null}
                        </span>
                      </li>
                    ))}
                  </ol>
                </details>
              ) : null}
            </li>
          );
        })}
      </ol>
    </section>
  );
}
