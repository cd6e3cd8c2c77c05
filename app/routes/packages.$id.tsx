import { readForm } from "~/lib/http/body";
import { requireIdParam, zId } from "~/lib/http/ids";
import { readQuery } from "~/lib/http/text";
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.$id";
import { requirePermission, requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import {
  changeStatus,
  getBenchState,
  getPackageHeader,
  listStatusChanges,
  EDITABLE_STATUSES,
  STATUS_TRANSITIONS,
} from "~/lib/packages/store.server";
import { compareStates, listRevisions, restoreState } from "~/lib/packages/revisions.server";
import { parsePick } from "~/lib/packages/revisions";
import { PACKAGE_STATUSES } from "../../db/schema/packages";
import { StatusBadge } from "~/components/packages/status-badge";
import { RevisionList } from "~/components/packages/revision-list";
import { When } from "~/components/ui/when";
import { PackageSummary } from "~/components/packages/package-summary";
import { getUnits } from "~/lib/units-pref.server";
import { statusLabel } from "~/lib/format/labels";
import { listPhotos } from "~/lib/photos/photos.server";
import { PhotoSection } from "~/components/photos/photo-section";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "packages:read");
  const db = getDb();
  const id = requireIdParam(params);
  const header = Number.isInteger(id) && id > 0 ? await getPackageHeader(db, id) : null;
  if (!header) throw data("No package with this number.", { status: 404 });
  const q = readQuery(request);
  const asked = q.has("a") || q.has("b");
  const a = parsePick(q.get("a"));
  const b = parsePick(q.get("b"));
  const badPick = q.get("a") && !a ? "a" : q.get("b") && !b ? "b" : null;
  if (badPick)
    throw data(`“${badPick}” names a revision (r3) or an edit (e17) to compare.`, {
      status: 400,
    });
  const [revisions, statuses, compare, state, units, photos] = await Promise.all([
    listRevisions(db, id),
    listStatusChanges(db, id),
    a && b ? compareStates(db, id, a, b) : Promise.resolve(null),
    getBenchState(db, id, can(user.role, "prices:read")),
    getUnits(db, user.id),
    listPhotos(db, id),
  ]);
  const editable = EDITABLE_STATUSES.includes(header.status);
  const nextStep = can(user.role, "packages:edit")
    ? editable
      ? {
          text: "Finish the spec on the bench: fill the empty slots, clear the conflicts, and check the cautions.",
          link: `/packages/${header.id}/bench`,
          label: "Open the spec bench",
        }
      : {
          text: `The spec is locked while the package is ${statusLabel(header.status).toLowerCase()}; the bench shows it read-only.`,
          link: `/packages/${header.id}/bench`,
          label: "See the bench",
        }
    : {
        text:
          header.status === "draft"
            ? "The builder is drafting the spec. Review the figures and findings, then move the status when the quote has gone out."
            : "Review the figures and findings on the bench (read-only), and move the status as the work goes on.",
        link: `/packages/${header.id}/bench`,
        label: "See the bench",
      };
  return {
    header,
    revisions,
    statuses,
    compare,
    compareAsked: asked,
    transitions: header.isTemplate ? [] : STATUS_TRANSITIONS[header.status],
    canEdit: can(user.role, "packages:edit") && EDITABLE_STATUSES.includes(header.status),
    canStatus: can(user.role, "packages:create"),
    state,
    units,
    nextStep,
    photos,
    canPhotos: can(user.role, "dyno:log"),
    canQuote: can(user.role, "prices:read"),
  };
}

const ActionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("status"), to: z.enum(PACKAGE_STATUSES) }),
  z.object({
    intent: z.literal("restore"),
    // "r3" a revision, "e17" the state right after a single edit
    target: z
      .string({ error: "Pick a revision to restore" })
      .transform((t, ctx) => parsePick(t) ?? (ctx.addIssue("Pick a revision to restore"), z.NEVER)),
    expectedVersion: zId("The page did not say which version it showed; reload it"),
  }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  // who may send anything here at all, before reading what was sent
  const staff = await requireRole(request, "owner", "builder", "service_writer");
  const form = Object.fromEntries(await readForm(request));
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
      ? data({
          ok: true as const,
          message: `Status is now ${statusLabel(parsed.data.to).toLowerCase()}.`,
        })
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
  const { target, expectedVersion } = parsed.data;
  const out = await restoreState(db, id, target, expectedVersion, user.id);
  const what =
    target.kind === "edit" ? `The state after edit ${target.number}` : `Revision ${target.number}`;
  if (!out)
    return data({ ok: false as const, message: "No such revision or edit." }, { status: 404 });
  if (out.ok)
    return data({
      ok: true as const,
      message: `${what} restored as edit ${out.version} (revision ${out.revision}).`,
    });
  if ("stale" in out && out.stale) {
    return data(
      {
        ok: false as const,
        message: `Not restored: ${out.savedBy ?? "someone"} saved edit ${out.currentVersion} while you were looking. Review it and try again.`,
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
          className="ml-auto rounded bg-teal-dark px-3 py-1.5 font-semibold text-white hover:bg-ink"
        >
          Open the spec bench
        </Link>
        {header.bikeId ? (
          <Link
            to={`/packages/${header.id}/keep-check`}
            className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text"
          >
            Keep-check
          </Link>
        ) : null}
        {header.bikeId && loaderData.canQuote ? (
          <Link
            to={`/packages/${header.id}/quote`}
            className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text hover:bg-steel-50"
          >
            Quote
          </Link>
        ) : null}
        <Link
          to={`/packages/${header.id}/sheet`}
          className="rounded border border-teal-dark bg-white px-3 py-1.5 font-semibold text-teal-text hover:bg-steel-50"
        >
          Spec sheet
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
      {loaderData.state ? (
        <PackageSummary
          id={header.id}
          customer={header.isTemplate ? null : header.customerName}
          bike={header.isTemplate ? null : header.bikeLabel}
          spec={loaderData.state.spec}
          computation={loaderData.state.computation}
          findings={loaderData.state.findings}
          parts={loaderData.state.parts}
          units={loaderData.units}
          nextStep={loaderData.nextStep}
        />
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
                  Move to {statusLabel(t).toLowerCase()}
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
                <span className="text-steel-700">
                  <When at={s.at} time />
                </span>{" "}
                · {s.from ? `${statusLabel(s.from)} → ` : ""}
                {statusLabel(s.to)} · {s.by ?? "—"}
              </li>
            ))}
          </ol>
        </section>
        <RevisionList
          packageId={header.id}
          revisions={revisions}
          version={header.version}
          canEdit={loaderData.canEdit}
          busy={busy}
          compare={compare}
          compareAsked={loaderData.compareAsked}
        />
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
