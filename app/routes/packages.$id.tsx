import { requireIdParam } from "~/lib/http/ids";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.$id";
import { requirePermission, requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import {
  changeStatus,
  compareRevisions,
  getPackageHeader,
  listRevisions,
  listStatusChanges,
  restoreRevision,
  EDITABLE_STATUSES,
  STATUS_TRANSITIONS,
} from "~/lib/packages/store.server";
import { PACKAGE_STATUSES } from "../../db/schema/packages";
import { StatusBadge } from "~/components/packages/status-badge";
import { RevisionCompare } from "~/components/packages/revision-compare";
import { listPhotos } from "~/lib/photos/photos.server";
import { PhotoSection } from "~/components/photos/photo-section";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "packages:read");
  const db = getDb();
  const id = requireIdParam(params);
  const header = Number.isInteger(id) && id > 0 ? await getPackageHeader(db, id) : null;
  if (!header) throw data("No package with this number.", { status: 404 });
  const url = new URL(request.url);
  const a = Number(url.searchParams.get("a"));
  const b = Number(url.searchParams.get("b"));
  const [revisions, statuses, compare, photos] = await Promise.all([
    listRevisions(db, id),
    listStatusChanges(db, id),
    a > 0 && b > 0 ? compareRevisions(db, id, a, b) : Promise.resolve(null),
    listPhotos(db, id),
  ]);
  return {
    header,
    revisions,
    statuses,
    compare,
    compareAsked: a > 0 && b > 0,
    transitions: header.isTemplate ? [] : STATUS_TRANSITIONS[header.status],
    canEdit: can(user.role, "packages:edit") && EDITABLE_STATUSES.includes(header.status),
    canStatus: can(user.role, "packages:create"),
    photos,
    canPhotos: can(user.role, "dyno:log"),
  };
}

const ActionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("status"), to: z.enum(PACKAGE_STATUSES) }),
  z.object({
    intent: z.literal("restore"),
    revision: z.coerce.number().int().positive(),
    expectedRevision: z.coerce.number().int().positive(),
  }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  // who may send anything here at all, before reading what was sent
  const staff = await requireRole(request, "owner", "builder", "service_writer");
  const form = Object.fromEntries(await request.formData());
  const parsed = ActionSchema.safeParse(form);
  const id = requireIdParam(params);
  if (!parsed.success)
    return data(
      { ok: false as const, message: "That action was not understood." },
      { status: 400 },
    );
  const db = getDb();
  if (parsed.data.intent === "status") {
    const user = staff;
    const out = await changeStatus(db, id, parsed.data.to, user.id);
    return out.ok
      ? data({ ok: true as const, message: `Status is now ${parsed.data.to.replace("_", " ")}.` })
      : data({ ok: false as const, message: out.message }, { status: 400 });
  }
  const user = await requireRole(request, "owner", "builder");
  const header = await getPackageHeader(db, id);
  if (!header) throw data("No package with this number.", { status: 404 });
  if (!EDITABLE_STATUSES.includes(header.status))
    return data(
      { ok: false as const, message: "This package's spec is locked at its status." },
      { status: 400 },
    );
  const out = await restoreRevision(
    db,
    id,
    parsed.data.revision,
    parsed.data.expectedRevision,
    user.id,
  );
  if (!out) return data({ ok: false as const, message: "No such revision." }, { status: 404 });
  if (out.ok)
    return data({
      ok: true as const,
      message: `Revision ${parsed.data.revision} restored as revision ${out.revision}.`,
    });
  if ("stale" in out && out.stale) {
    return data(
      {
        ok: false as const,
        message: `Not restored: ${out.savedBy ?? "someone"} saved revision ${out.currentRevision} while you were looking. Review it and try again.`,
      },
      { status: 409 },
    );
  }
  throw data("No package with this number.", { status: 404 });
}

export default function PackageOverview({ loaderData, actionData }: Route.ComponentProps) {
  const { header, revisions, statuses, compare } = loaderData;
  const busy = useNavigation().state !== "idle";
  return (
    <main className="mx-auto max-w-6xl px-4 py-6">
      <p className="text-sm text-steel-700">
        <Link to="/packages" className="underline">
          Packages
        </Link>{" "}
        / #{header.id}
      </p>
      <div className="mt-1 flex flex-wrap items-baseline gap-3">
        <h1 className="text-3xl font-semibold text-ink">{header.name}</h1>
        {header.isTemplate ? (
          <span className="rounded bg-steel-100 px-1.5 text-sm">Shop template</span>
        ) : (
          <StatusBadge status={header.status} />
        )}
        <Link
          to={`/packages/${header.id}/bench`}
          className="ml-auto rounded bg-teal px-3 py-1.5 font-semibold text-white hover:bg-teal-dark"
        >
          Open the spec bench
        </Link>
        <Link
          to={`/packages/${header.id}/dyno`}
          className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text hover:bg-steel-50"
        >
          Dyno log
        </Link>
      </div>
      <p className="mt-1 text-steel-700">
        {header.isTemplate
          ? "Starting point for new packages"
          : `${header.customerName} · ${header.bikeLabel}`}{" "}
        · builder {header.builderName ?? "—"} ·{" "}
        <span className="num">revision {header.revision}</span>
      </p>
      {actionData ? (
        <p
          role="status"
          className={`mt-3 rounded border p-2 text-sm ${actionData.ok ? "border-green text-green-text" : "border-red text-red-text"}`}
        >
          {actionData.message}
        </p>
      ) : null}
      <div className="mt-4 grid grid-cols-1 gap-4 lg:grid-cols-[1fr_2fr]">
        <section className="rounded border border-steel-200 bg-white p-3">
          <h2 className="font-semibold text-ink">Status</h2>
          {loaderData.canStatus && loaderData.transitions.length > 0 ? (
            <Form method="post" className="mt-2 flex flex-wrap gap-2">
              <input type="hidden" name="intent" value="status" />
              {loaderData.transitions.map((t) => (
                <button
                  key={t}
                  name="to"
                  value={t}
                  disabled={busy}
                  className="rounded border border-steel-300 px-2 py-1 text-sm font-semibold hover:bg-steel-100"
                >
                  Move to {t.replace("_", " ")}
                </button>
              ))}
            </Form>
          ) : (
            <p className="mt-1 text-sm text-steel-700">
              {header.isTemplate
                ? "Templates have no status."
                : "No change available to your role."}
            </p>
          )}
          <ol className="mt-3 text-sm">
            {statuses.map((s, i) => (
              <li key={i} className="border-t border-steel-100 py-1">
                <span className="num text-steel-700">{new Date(s.at).toLocaleString()}</span> ·{" "}
                {s.from ? `${s.from.replace("_", " ")} → ` : ""}
                {s.to.replace("_", " ")} · {s.by ?? "—"}
              </li>
            ))}
          </ol>
        </section>
        <section className="rounded border border-steel-200 bg-white p-3">
          <h2 className="font-semibold text-ink">Revisions</h2>
          <Form method="get" className="mt-2 flex flex-wrap items-end gap-2 text-sm">
            <label className="flex flex-col">
              <span className="text-xs text-steel-700">Compare</span>
              <select
                name="a"
                defaultValue={compare?.a.revision ?? Math.max(1, header.revision - 1)}
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
                defaultValue={compare?.b.revision ?? header.revision}
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
          ) : loaderData.compareAsked ? (
            <p className="mt-2 text-sm text-red-text">One of those revisions does not exist.</p>
          ) : null}
          <div className="mt-3 overflow-x-auto">
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
                      {r.savedBy ?? "—"} · {new Date(r.savedAt).toLocaleString()}
                    </td>
                    <td className="num pr-2 align-top whitespace-nowrap">
                      {r.findings}
                      {r.conflicts ? (
                        <span className="text-red-text"> ({r.conflicts} conflict)</span>
                      ) : null}
                    </td>
                    <td>
                      {loaderData.canEdit && r.revision !== header.revision ? (
                        <Form method="post">
                          <input type="hidden" name="intent" value="restore" />
                          <input type="hidden" name="revision" value={r.revision} />
                          <input type="hidden" name="expectedRevision" value={header.revision} />
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
      </div>
      <PhotoSection
        packageId={header.id}
        photos={loaderData.photos}
        canEdit={loaderData.canPhotos}
      />
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `${data?.header.name ?? "Package"} · Torquewright` }];
}
