// On the bench: the open revision (how many edits it holds) and the form that closes it
// with a short note saying why, so the revision list reads as the builder's steps.
import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useEffect } from "react";
import { Link, useFetcher } from "react-router";
import { MAX_NOTE_LENGTH, RevisionNoteSchema } from "~/lib/packages/revisions";
import type { closeRevisionAction } from "~/lib/packages/revisions.server";

type Answer = Awaited<ReturnType<typeof closeRevisionAction>>["data"];

export function RevisionClose({
  packageId,
  revision,
  open,
  edits,
  version,
  canEdit,
  pending,
  onClosed,
}: {
  packageId: number;
  revision: number;
  open: boolean;
  edits: number;
  version: number;
  canEdit: boolean;
  /** edits still being saved: the note waits for them */
  pending: boolean;
  onClosed: (revision: number) => void;
}) {
  const fetcher = useFetcher<Answer>({ key: `close-revision-${packageId}` });
  const [form, fields] = useForm({
    id: `close-revision-${packageId}`,
    lastResult: fetcher.state === "idle" ? fetcher.data?.result : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: RevisionNoteSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onBlur",
  });
  const closed = fetcher.data?.closed;
  useEffect(() => {
    if (closed) onClosed(closed.revision);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- once per answer
  }, [closed]);

  return (
    <section
      aria-label="Revision"
      data-testid="revision-bar"
      className="mb-3 flex flex-wrap items-start gap-x-4 gap-y-2 rounded border border-steel-200 bg-white px-3 py-2 text-sm"
    >
      <p className="py-1 text-steel-700" data-testid="revision-state">
        {open ? (
          <>
            <span className="font-semibold text-ink">Revision {revision} is open</span> ·{" "}
            <span className="num">{edits}</span> {edits === 1 ? "edit" : "edits"}, each saved as you
            make it
          </>
        ) : (
          <>
            Revision {revision} is closed · your next edit opens revision {revision + 1}
          </>
        )}
        {" · "}
        <Link to={`/packages/${packageId}#revisions`} className="text-teal-text underline">
          All revisions
        </Link>
      </p>
      {open && canEdit ? (
        <fetcher.Form
          method="post"
          {...getFormProps(form)}
          className="flex flex-1 flex-wrap items-start gap-2"
        >
          <input type="hidden" name="intent" value="close-revision" />
          <input type="hidden" name="expectedVersion" value={version} />
          <div className="min-w-[16rem] flex-1">
            <label htmlFor={fields.note.id} className="sr-only">
              Note for revision {revision}
            </label>
            <input
              {...getInputProps(fields.note, { type: "text" })}
              maxLength={MAX_NOTE_LENGTH}
              placeholder="Why: e.g. 106.4 bore, thinner gasket for 10.5:1"
              className={`w-full rounded border px-2 py-1 ${fields.note.errors ? "border-red" : "border-steel-300"}`}
            />
            {fields.note.errors ? (
              <p id={fields.note.errorId} className="mt-0.5 text-red-text">
                {fields.note.errors.join(" ")}
              </p>
            ) : null}
            {form.errors ? (
              <p id={form.errorId} role="alert" className="mt-0.5 text-red-text">
                {form.errors.join(" ")}
              </p>
            ) : null}
          </div>
          <button
            type="submit"
            disabled={pending || fetcher.state !== "idle"}
            className="rounded bg-ink px-3 py-1 font-semibold text-white disabled:opacity-60"
          >
            Close revision {revision}
          </button>
        </fetcher.Form>
      ) : null}
    </section>
  );
}
