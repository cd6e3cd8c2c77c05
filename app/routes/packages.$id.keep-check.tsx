import { readForm } from "~/lib/http/body";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.$id.keep-check";
import { MarkBadge } from "~/components/keep-check/mark-badge";
import { PrintButton } from "~/components/keep-check/print-button";
import { when } from "~/components/requests/request-status";
import { Caution, Notice } from "~/components/ui/alert";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { getDb } from "~/lib/db.server";
import { parseId, requireIdParam, zId } from "~/lib/http/ids";
import {
  clearOverride,
  computeKeepCheck,
  markChecked,
  setOverride,
} from "~/lib/keep-check/keep-check.server";
import { MARK_LABELS } from "~/lib/keep-check/marks";
import { hasControl, CONTROL_MESSAGE } from "~/lib/requests/text";
import { KEEP_MARKS } from "../../db/schema/requests";

const OverrideSchema = z.object({
  intent: z.literal("override"),
  bikePartId: zId("Pick a part on this bike"),
  mark: z.enum(KEEP_MARKS, { error: "Pick keep, replace or review" }),
  note: z
    .string({ error: "Say why the mark is changed" })
    .trim()
    .min(3, "Say why the mark is changed")
    .max(500, "Keep the note under 500 characters")
    .refine((v) => !hasControl(v), CONTROL_MESSAGE),
});
const ClearSchema = z.object({
  intent: z.literal("clear"),
  bikePartId: zId("Pick a part on this bike"),
});

async function load(request: Request, params: Record<string, string | undefined>) {
  const user = await requirePermission(request, "keepcheck:read");
  const id = requireIdParam(params);
  const check = await computeKeepCheck(getDb(), id);
  if (!check) throw data("Not found", { status: 404 });
  // a builder reads the keep-checks of the packages they build
  if (user.role === "builder" && check.package.builderId !== user.id)
    throw data("This keep-check belongs to another builder's package.", { status: 403 });
  return { user, check };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, check } = await load(request, params);
  return { check, canEdit: can(user.role, "keepcheck:edit") };
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = await readForm(request);
  const user = await requirePermission(request, "keepcheck:edit");
  const { check } = await load(request, params);
  const db = getDb();
  const intent = form.get("intent");
  if (intent === "done") {
    await markChecked(db, check, user.id);
    return { intent, bikePartId: null, error: null, saved: "Keep-check recorded." };
  }
  const schema = intent === "clear" ? ClearSchema : OverrideSchema;
  const s = parseWithZod(form, { schema });
  if (s.status !== "success")
    return data(
      {
        intent,
        bikePartId: parseId(form.get("bikePartId")),
        error: s.reply().error ?? null,
        saved: null,
      },
      { status: 400 },
    );
  if (!check.rows.some((r) => r.bikePartId === s.value.bikePartId))
    throw data("That part is not on this bike.", { status: 404 });
  if (s.value.intent === "override")
    await setOverride(
      db,
      check.package.id,
      s.value.bikePartId,
      s.value.mark,
      s.value.note,
      user.id,
    );
  else await clearOverride(db, check.package.id, s.value.bikePartId);
  return { intent, bikePartId: s.value.bikePartId, error: null, saved: "Mark saved." };
}

export default function KeepCheckPage({ loaderData, actionData }: Route.ComponentProps) {
  const { check, canEdit } = loaderData;
  const busy = useNavigation().state !== "idle";
  const counts = { keep: 0, replace: 0, review: 0 };
  for (const r of check.rows) counts[r.mark]++;
  return (
    <main className="mx-auto max-w-6xl px-4 py-6 print:max-w-none print:px-0 print:py-0">
      <PageHeader
        back={{ to: `/packages/${check.package.id}`, label: check.package.name }}
        eyebrow="Keep-check"
        title={check.package.name}
        lead={
          <>
            {check.customer.name} · <Link to={`/bikes/${check.bike.id}`}>{check.bike.label}</Link> ·
            builder {check.package.builder ?? "not set"} · package power{" "}
            {check.package.powerHp !== null ? `${check.package.powerHp} hp` : "not set"}
          </>
        }
        actions={<PrintButton />}
      />
      <p className="mt-3 text-sm text-steel-700">
        <span className="font-semibold text-ink">{counts.replace}</span> to replace (the quote's
        parts list) · <span className="font-semibold text-ink">{counts.review}</span> to review ·{" "}
        <span className="font-semibold text-ink">{counts.keep}</span> to keep
        {check.checked
          ? ` · checked by ${check.checked.by ?? "staff"} ${when(check.checked.at)}`
          : ""}
      </p>
      {actionData?.saved ? <Notice className="mt-3 print:hidden">{actionData.saved}</Notice> : null}
      {check.rows.length === 0 ? (
        <p className="mt-6 text-steel-700">
          No installed part is recorded on this bike. Add them on the{" "}
          <Link to={`/bikes/${check.bike.id}`} className="text-teal-text underline">
            bike's page
          </Link>
          .
        </p>
      ) : (
        <ol className="mt-4 space-y-3">
          {check.rows.map((r) => {
            const mine = actionData?.bikePartId === r.bikePartId ? actionData : null;
            const err = mine?.error as Record<string, string[] | null> | null | undefined;
            return (
              <li
                key={r.bikePartId}
                className="rounded border border-steel-200 bg-white p-4 print:break-inside-avoid print:rounded-none print:border-x-0 print:border-t-0 print:p-2"
                data-testid="keep-row"
              >
                <div className="flex flex-wrap items-start gap-3">
                  <MarkBadge mark={r.mark} />
                  <div className="min-w-0 flex-1">
                    <p className="font-semibold text-ink">{r.label}</p>
                    <p className="text-sm text-steel-700">
                      {r.categoryLabel}
                      {r.free ? " · free text" : ""}
                      {r.fittedOn ? ` · fitted ${r.fittedOn}` : ""}
                    </p>
                    <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm">
                      {r.reasons.map((x) => (
                        <li key={x.text} data-testid="reason">
                          {x.text}
                        </li>
                      ))}
                    </ul>
                    {r.override ? (
                      <p
                        className="mt-2 rounded bg-steel-50 px-2 py-1 text-sm"
                        data-testid="override"
                      >
                        <strong>Overridden</strong> from {MARK_LABELS[r.computed].toLowerCase()} to{" "}
                        {MARK_LABELS[r.override.mark].toLowerCase()} by {r.override.by ?? "staff"},{" "}
                        {when(r.override.at)}: “{r.override.note}”
                      </p>
                    ) : null}
                  </div>
                </div>
                {canEdit ? (
                  <details className="mt-2 print:hidden" open={Boolean(err)}>
                    <summary className="cursor-pointer text-sm font-medium text-teal-text">
                      {r.override ? "Change the override" : "Override the mark"}
                    </summary>
                    <Form method="post" className="mt-2 flex flex-wrap items-end gap-3">
                      <input type="hidden" name="intent" value="override" />
                      <input type="hidden" name="bikePartId" value={r.bikePartId} />
                      <div>
                        <label
                          htmlFor={`mark-${r.bikePartId}`}
                          className="block text-sm font-semibold"
                        >
                          Mark
                        </label>
                        <select
                          id={`mark-${r.bikePartId}`}
                          name="mark"
                          defaultValue={r.override?.mark ?? r.computed}
                          className="mt-1 rounded border border-steel-300 bg-white px-2 py-1.5"
                        >
                          {KEEP_MARKS.map((m) => (
                            <option key={m} value={m}>
                              {MARK_LABELS[m]}
                            </option>
                          ))}
                        </select>
                      </div>
                      <div className="min-w-0 flex-1">
                        <label
                          htmlFor={`note-${r.bikePartId}`}
                          className="block text-sm font-semibold"
                        >
                          Note (why)
                        </label>
                        <input
                          id={`note-${r.bikePartId}`}
                          name="note"
                          defaultValue={r.override?.note ?? ""}
                          aria-invalid={err?.note ? true : undefined}
                          aria-describedby={err?.note ? `note-${r.bikePartId}-error` : undefined}
                          className={`mt-1 block w-full rounded border bg-white px-2 py-1.5 ${err?.note ? "border-red" : "border-steel-300"}`}
                        />
                        {err?.note ? (
                          <p
                            id={`note-${r.bikePartId}-error`}
                            className="mt-1 text-sm text-red-text"
                          >
                            {err.note.join(" ")}
                          </p>
                        ) : null}
                      </div>
                      <button
                        type="submit"
                        disabled={busy}
                        className="rounded bg-teal-dark px-3 py-1.5 font-semibold text-white hover:bg-ink"
                      >
                        Save the mark
                      </button>
                    </Form>
                    {r.override ? (
                      <Form method="post" className="mt-2">
                        <input type="hidden" name="intent" value="clear" />
                        <input type="hidden" name="bikePartId" value={r.bikePartId} />
                        <button type="submit" className="text-sm text-red-text underline">
                          Back to the computed mark
                        </button>
                      </Form>
                    ) : null}
                  </details>
                ) : null}
              </li>
            );
          })}
        </ol>
      )}
      {canEdit && check.rows.length > 0 ? (
        <Form method="post" className="mt-4 print:hidden">
          <input type="hidden" name="intent" value="done" />
          <button
            type="submit"
            disabled={busy}
            className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink"
          >
            {check.checked ? "Record the keep-check again" : "Record the keep-check as done"}
          </button>
        </Form>
      ) : null}
      <Caution className="mt-6">
        A mark is the shop's starting point, not a fitness check: brakes, axles and suspension are
        inspected by a qualified technician, torque values and limits come from the parts maker's
        instructions, and local rules on emissions and noise apply.
      </Caution>
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `Keep-check · ${d?.check?.package.name ?? "Package"} · Torquewright` }];
}
