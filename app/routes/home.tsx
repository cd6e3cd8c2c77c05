import { Link } from "react-router";
import type { Route } from "./+types/home";
import { navFor } from "~/components/app-header";
import { requireUser } from "~/lib/auth.server";
import { getDb } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { can, ROLE_LABELS } from "~/lib/permissions";
import { getShopOverview } from "~/lib/shop.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { shop, counts } = await getShopOverview(getDb());
  const stats: { label: string; value: number; to?: string }[] = [];
  if (can(user.role, "customers:read")) {
    stats.push({ label: "Customers on file", value: counts.customers });
    stats.push({ label: "Bikes on file", value: counts.bikes });
  }
  if (can(user.role, "staff:manage")) stats.push({ label: "Active staff", value: counts.staff, to: "/staff" });
  const links = navFor(user.role, { localMail: Boolean(env().LOCAL_MAIL_API_URL) }).filter((l) => l.to !== "/");
  return { shop, user, stats, links };
}

const LEADS: Record<string, string> = {
  owner: "The shop's rules, catalog, rates and staff are yours to keep.",
  builder: "Draft packages on the spec bench, check the numbers, send quotes.",
  service_writer: "Take build requests, keep customer and bike records, send quotes.",
  apprentice: "Study the shop's published packages, with the work shown.",
};

export default function Home({ loaderData }: Route.ComponentProps) {
  const { shop, user, stats, links } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">Engine program</p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">{shop?.name ?? "Your shop"}</h1>
      {shop ? <p className="mt-1 text-steel-700">{shop.city}</p> : null}
      <p className="mt-4 text-lg text-graphite">
        Hello {user.name.split(" ")[0]} — {ROLE_LABELS[user.role].toLowerCase()}. {LEADS[user.role]}
      </p>
      {stats.length > 0 ? (
        <dl className="mt-6 grid grid-cols-1 gap-4 sm:grid-cols-3">
          {stats.map((s) => (
            <Stat key={s.label} {...s} />
          ))}
        </dl>
      ) : null}
      {links.length > 0 ? (
        <section aria-labelledby="open" className="mt-8">
          <h2 id="open" className="text-lg font-semibold text-ink">Open</h2>
          <ul className="mt-2 flex flex-wrap gap-2">
            {links.map((l) => (
              <li key={l.to}>
                <Link to={l.to} className="inline-block rounded border border-steel-200 bg-white px-4 py-2 font-medium text-teal-text hover:border-teal">
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

function Stat({ label, value, to }: { label: string; value: number; to?: string }) {
  const body = (
    <>
      <dt className="text-sm text-steel-700">{label}</dt>
      <dd className="num mt-1 text-3xl font-semibold text-ink">{value}</dd>
    </>
  );
  return to ? (
    <Link to={to} className="block rounded border border-steel-200 bg-white p-4 hover:border-teal">
      {body}
    </Link>
  ) : (
    <div className="rounded border border-steel-200 bg-white p-4">{body}</div>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Home · Torquewright" }];
}
