import type { Route } from "./+types/home";
import { getDb } from "~/lib/db.server";
import { getShopOverview } from "~/lib/shop.server";

export async function loader(_: Route.LoaderArgs) {
  return getShopOverview(getDb());
}

export default function Home({ loaderData }: Route.ComponentProps) {
  const { shop, counts } = loaderData;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">Engine program</p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">{shop?.name ?? "Your shop"}</h1>
      {shop ? <p className="mt-1 text-steel-700">{shop.city}</p> : null}
      <dl className="mt-8 grid grid-cols-1 gap-4 sm:grid-cols-3">
        <Stat label="Customers on file" value={counts.customers} />
        <Stat label="Bikes on file" value={counts.bikes} />
        <Stat label="Active staff" value={counts.staff} />
      </dl>
    </main>
  );
}

function Stat({ label, value }: { label: string; value: number }) {
  return (
    <div className="rounded border border-steel-200 bg-white p-4">
      <dt className="text-sm text-steel-700">{label}</dt>
      <dd className="num mt-1 text-3xl font-semibold text-ink">{value}</dd>
    </div>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Home · Torquewright" }];
}
