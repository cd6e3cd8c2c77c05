import { Link } from "react-router";
import type { Route } from "./+types/home";
import { localServicesFor, navFor } from "~/components/shell/app-header";
import { requireUser } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { homeStats, type HomeStat } from "~/lib/home.server";
import { can, ROLE_LABELS } from "~/lib/auth/permissions";
import { STATUS_LABELS, statusLabel } from "~/lib/format/labels";
import { getShopOverview } from "~/lib/shop.server";
import { waitingOnKeepCheck } from "~/lib/keep-check/keep-check.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const db = getDb();
  const [{ shop }, { stats, statuses }, keepChecks] = await Promise.all([
    getShopOverview(db),
    homeStats(db, user),
    can(user.role, "keepcheck:edit") ? waitingOnKeepCheck(db) : Promise.resolve([]),
  ]);
  const localMail = Boolean(env().LOCAL_MAIL_API_URL);
  const links = navFor(user.role, { localMail }).filter((l) => l.to !== "/");
  const local = localServicesFor(user.role, { localMail });
  // each role gets only the shop fields it may see: the labour rate is a price
  const shopView = shop
    ? {
        name: shop.name,
        city: shop.city,
        phone: shop.phone,
        email: shop.email,
        ...(can(user.role, "prices:read") ? { labour_rate_cents: shop.labour_rate_cents } : {}),
      }
    : null;
  return { shop: shopView, user, stats, statuses, links, keepChecks, local };
}

const STATUS_ORDER: string[] = Object.keys(STATUS_LABELS);

const LEADS: Record<string, string> = {
  owner: "The shop's fit rules, catalog, settings and staff are yours to keep.",
  builder: "Draft packages on the spec bench, check the numbers, send quotes.",
  service_writer: "Take build requests, keep customer and bike records, send quotes.",
  apprentice: "Study the shop's published packages, with the work shown.",
};

export default function Home({ loaderData }: Route.ComponentProps) {
  const { shop, user, stats, statuses, links, keepChecks, local } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">
        Engine program
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">{shop?.name ?? "Your shop"}</h1>
      {shop ? <p className="mt-1 text-steel-700">{shop.city}</p> : null}
      <p className="mt-4 text-lg text-graphite">
        Hello {user.name.split(" ")[0]} — {ROLE_LABELS[user.role].toLowerCase()}. {LEADS[user.role]}
      </p>
      {stats.length > 0 ? (
        <ul className="mt-6 grid grid-cols-2 gap-3 sm:gap-4 lg:grid-cols-4">
          {stats.map((s) => (
            <li key={s.label}>
              <Stat {...s} />
            </li>
          ))}
        </ul>
      ) : null}
      {keepChecks.length > 0 ? (
        <section aria-labelledby="keep-checks" className="mt-8">
          <h2 id="keep-checks" className="text-lg font-semibold text-ink">
            Waiting on a keep-check
          </h2>
          <ul className="mt-2 divide-y divide-steel-100 rounded border border-steel-200 bg-white">
            {keepChecks.map((k) => (
              <li key={k.id} className="px-4 py-2">
                <Link
                  to={`/packages/${k.id}/keep-check`}
                  className="font-medium text-teal-text underline"
                >
                  {k.name}
                </Link>{" "}
                <span className="text-sm text-steel-700">
                  {k.customer} · {k.year} {k.model}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {statuses.length > 0 ? (
        <section aria-labelledby="by-status" className="mt-8">
          <h2 id="by-status" className="text-lg font-semibold text-ink">
            Packages by status
          </h2>
          <ul className="mt-2 flex flex-wrap gap-2">
            {[...statuses]
              .sort((a, b) => STATUS_ORDER.indexOf(a.status) - STATUS_ORDER.indexOf(b.status))
              .map((s) => (
                <li key={s.status}>
                  <Link
                    to={`/packages?status=${encodeURIComponent(s.status)}`}
                    className="inline-block rounded border border-steel-200 bg-white px-4 py-2 hover:border-teal-dark"
                  >
                    <span className="text-sm text-steel-700">{statusLabel(s.status)}</span>{" "}
                    <span className="num text-lg font-semibold text-ink">{s.n}</span>
                  </Link>
                </li>
              ))}
          </ul>
        </section>
      ) : null}
      {links.length > 0 ? (
        <section aria-labelledby="open" className="mt-8">
          <h2 id="open" className="text-lg font-semibold text-ink">
            Open
          </h2>
          <ul className="mt-2 flex flex-wrap gap-2">
            {links.map((l) => (
              <li key={l.to}>
                <Link
                  to={l.to}
                  className="inline-block rounded border border-steel-200 bg-white px-4 py-2 font-medium text-teal-text hover:border-teal"
                >
                  {l.label}
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {local.length > 0 ? (
        <section
          aria-labelledby="local-h"
          className="mt-12 rounded border border-dashed border-steel-300 p-4"
        >
          <h2
            id="local-h"
            className="text-sm font-semibold uppercase tracking-wider text-steel-700"
          >
            Local services
          </h2>
          <p className="mt-1 text-sm text-steel-700">
            Development tools of this machine, not part of the shop&apos;s work.
          </p>
          <ul className="mt-2 flex flex-wrap gap-2">
            {local.map((l) => (
              <li key={l.to}>
                <Link to={l.to} className="text-sm font-medium text-teal-text underline">
                  {l.label}
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </main>
  );
}

function Stat({ label, value, to, note }: HomeStat) {
  const body = (
    <>
      <span className="block text-sm text-steel-700">{label}</span>
      <span className="num mt-1 block text-3xl font-semibold text-ink">{value}</span>
      {note ? <span className="mt-1 block text-sm text-amber-text">{note}</span> : null}
    </>
  );
  return to ? (
    <Link
      to={to}
      className="block h-full rounded border border-steel-200 bg-white p-4 hover:border-teal-dark"
    >
      {body}
    </Link>
  ) : (
    <div className="h-full rounded border border-steel-200 bg-white p-4">{body}</div>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Home · Torquewright" }];
}
