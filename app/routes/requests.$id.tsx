import { readForm } from "~/lib/http/body";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/requests.$id";
import { ConvertPanel } from "~/components/requests/convert-panel";
import { RequestStatusBadge, when } from "~/components/requests/request-status";
import { Notice } from "~/components/ui/alert";
import { Section, PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { listFamilies } from "~/lib/engine-families/families.server";
import { requireIdParam } from "~/lib/http/ids";
import { ConvertSchema, NoteSchema, StatusSchema } from "~/lib/requests/convert-form";
import {
  budgetLabel,
  contactLabel,
  ridingLabel,
  STATUS_LABELS,
  timeFrameLabel,
} from "~/lib/requests/options";
import {
  addRequestNote,
  builderOptions,
  changeRequestStatus,
  convertRequest,
  findMatches,
  getRequest,
  REQUEST_TRANSITIONS,
} from "~/lib/requests/queue.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "requests:read");
  const id = requireIdParam(params);
  const db = getDb();
  const req = await getRequest(db, id);
  if (!req) throw data("Not found", { status: 404 });
  const [matches, builders, families, parts, categories] = await Promise.all([
    findMatches(db, req.email, req.phone),
    builderOptions(db),
    listFamilies(db),
    db
      .selectFrom("parts")
      .select(["id", "part_number", "name", "category"])
      .where("archived_at", "is", null)
      .orderBy("category")
      .orderBy("name")
      .execute(),
    db.selectFrom("part_categories").select(["slug", "label"]).orderBy("sort").execute(),
  ]);
  return {
    req,
    transitions: REQUEST_TRANSITIONS[req.status],
    convert: {
      matches,
      builders,
      families: families.map((f) => ({ value: String(f.id), label: f.name })),
      parts: parts.map((p) => ({
        id: p.id,
        label: `${p.part_number} ${p.name}`,
        category: p.category,
      })),
      categories: categories.map((c) => ({ value: c.slug, label: c.label })),
      lines: req.currentParts,
      defaultName: `${req.bikeYear} ${req.bikeModel} build`.slice(0, 120),
      familyId: req.engineFamilyId,
    },
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const formData = await readForm(request);
  const user = await requirePermission(request, "requests:edit");
  const id = requireIdParam(params);
  const db = getDb();
  const exists = await db
    .selectFrom("build_requests")
    .select("id")
    .where("id", "=", id)
    .executeTakeFirst();
  if (!exists) throw data("Not found", { status: 404 });
  const intent = formData.get("intent");
  if (intent === "status") {
    const submission = parseWithZod(formData, { schema: StatusSchema });
    if (submission.status !== "success")
      return data({ intent, result: submission.reply() }, { status: 400 });
    const out = await changeRequestStatus(db, id, submission.value.to, user.id);
    if (!out.ok)
      return data(
        { intent, result: submission.reply({ formErrors: [out.message] }) },
        { status: 400 },
      );
    return { intent, result: submission.reply({ resetForm: true }) };
  }
  if (intent === "note") {
    const submission = parseWithZod(formData, { schema: NoteSchema });
    if (submission.status !== "success")
      return data({ intent, result: submission.reply() }, { status: 400 });
    await addRequestNote(db, id, submission.value.body, user.id);
    return { intent, result: submission.reply({ resetForm: true }) };
  }
  if (intent === "convert") {
    const submission = parseWithZod(formData, { schema: ConvertSchema });
    if (submission.status !== "success")
      return data({ intent, result: submission.reply() }, { status: 400 });
    const out = await convertRequest(db, id, submission.value, user.id);
    if (!out.ok)
      return data(
        {
          intent,
          result: submission.reply(
            out.field
              ? { fieldErrors: { [out.field]: [out.message] } }
              : { formErrors: [out.message] },
          ),
        },
        { status: 400 },
      );
    return redirect(`/packages/${out.packageId}`);
  }
  return data(
    { intent: null, result: null, message: "That action was not understood." },
    { status: 400 },
  );
}

export default function RequestPage({ loaderData, actionData }: Route.ComponentProps) {
  const { req, transitions, convert } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state !== "idle";
  const statusError =
    actionData?.intent === "status" ? actionData.result?.error?.[""]?.[0] : undefined;
  const noteError = actionData?.intent === "note" ? actionData.result?.error?.body?.[0] : undefined;
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader
        back={{ to: "/requests", label: "Build requests" }}
        eyebrow={`Build request #${req.id}`}
        title={
          <>
            {req.name} <RequestStatusBadge status={req.status} />
          </>
        }
        lead={`${req.bikeYear} ${req.bikeModel} · received ${when(req.createdAt)}`}
      />
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_24rem]">
        <div className="space-y-6">
          <Section id="rider" title="Rider and bike">
            <dl className="grid gap-x-6 gap-y-2 rounded border border-steel-200 bg-white p-4 sm:grid-cols-2">
              <Item label="E-mail" value={req.email} />
              <Item label="Phone" value={req.phone ?? "not given"} />
              <Item label="Contact by" value={contactLabel(req.contactBy)} />
              <Item label="Engine" value={req.family ?? "Not sure"} />
              <Item
                label="Mileage"
                value={req.mileage !== null ? `${req.mileage.toLocaleString("en-US")} mi` : "—"}
              />
              <Item label="Budget" value={budgetLabel(req.budget)} />
              <Item label="Time frame" value={timeFrameLabel(req.timeFrame)} />
              <Item label="Riding" value={req.riding.map(ridingLabel).join(", ") || "not given"} />
            </dl>
          </Section>
          <Section id="wants" title="What the rider wants">
            <p className="whitespace-pre-line rounded border border-steel-200 bg-white p-4">
              {req.goals}
            </p>
          </Section>
          <Section id="on-it" title="On the bike now (rider's words)">
            {req.currentParts.length ? (
              <ul className="list-disc space-y-1 rounded border border-steel-200 bg-white p-4 pl-8">
                {req.currentParts.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            ) : (
              <p className="text-steel-700">Nothing listed.</p>
            )}
          </Section>
          <Section id="convert" title="Convert">
            {req.status === "converted" ? (
              <Notice>
                Converted:{" "}
                {req.customerId ? (
                  <Link to={`/customers/${req.customerId}`} className="underline">
                    customer
                  </Link>
                ) : null}
                {req.bikeId ? (
                  <>
                    ,{" "}
                    <Link to={`/bikes/${req.bikeId}`} className="underline">
                      bike
                    </Link>
                  </>
                ) : null}
                {req.packageId ? (
                  <>
                    ,{" "}
                    <Link to={`/packages/${req.packageId}`} className="underline">
                      draft package
                    </Link>
                  </>
                ) : null}
                .
              </Notice>
            ) : (
              <div className="rounded border border-steel-200 bg-white p-4">
                <ConvertPanel
                  data={convert}
                  lastResult={actionData?.intent === "convert" ? actionData.result : undefined}
                  busy={busy}
                />
              </div>
            )}
          </Section>
        </div>
        <aside className="space-y-6">
          {transitions.length ? (
            <Section id="status" title="Status">
              <Form method="post" className="flex flex-wrap items-end gap-2">
                <input type="hidden" name="intent" value="status" />
                <div>
                  <label htmlFor="to" className="block text-sm font-semibold">
                    Move to
                  </label>
                  <select
                    id="to"
                    name="to"
                    className="mt-1 rounded border border-steel-300 bg-white px-2 py-1.5"
                  >
                    {transitions.map((t) => (
                      <option key={t} value={t}>
                        {STATUS_LABELS[t]}
                      </option>
                    ))}
                  </select>
                </div>
                <button
                  type="submit"
                  disabled={busy}
                  className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text"
                >
                  Change
                </button>
              </Form>
              {statusError ? (
                <p role="alert" className="mt-1 text-sm text-red-text">
                  {statusError}
                </p>
              ) : null}
            </Section>
          ) : null}
          <Section id="notes" title="Notes">
            <Form method="post" className="space-y-2">
              <input type="hidden" name="intent" value="note" />
              <label htmlFor="note-body" className="sr-only">
                New note
              </label>
              <textarea
                id="note-body"
                name="body"
                rows={3}
                aria-invalid={noteError ? true : undefined}
                aria-describedby={noteError ? "note-error" : undefined}
                className="block w-full rounded border border-steel-300 bg-white px-3 py-2"
                placeholder="Called, left a message…"
              />
              {noteError ? (
                <p id="note-error" className="text-sm text-red-text">
                  {noteError}
                </p>
              ) : null}
              <button
                type="submit"
                disabled={busy}
                className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text"
              >
                Add note
              </button>
            </Form>
            <ul className="mt-3 space-y-2">
              {req.notes.map((n) => (
                <li key={n.id} className="rounded border border-steel-200 bg-white p-3 text-sm">
                  <p className="whitespace-pre-line">{n.body}</p>
                  <p className="mt-1 text-steel-700">
                    {n.by ?? "staff"} · {when(n.at)}
                  </p>
                </li>
              ))}
            </ul>
          </Section>
          <Section id="history" title="History">
            <ol className="space-y-1 text-sm">
              {req.history.map((h, i) => (
                <li key={i}>
                  <span className="num">{when(h.at)}</span> ·{" "}
                  {h.from ? `${STATUS_LABELS[h.from]} → ` : ""}
                  {STATUS_LABELS[h.to]} · {h.by ?? "staff"}
                </li>
              ))}
            </ol>
          </Section>
        </aside>
      </div>
    </main>
  );
}

function Item({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-sm text-steel-700">{label}</dt>
      <dd className="font-medium text-ink">{value}</dd>
    </div>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `${d?.req ? `Request #${d.req.id}` : "Request"} · Torquewright` }];
}
