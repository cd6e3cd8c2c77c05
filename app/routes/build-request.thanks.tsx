import { Link } from "react-router";
import type { Route } from "./+types/build-request.thanks";
import { getDb } from "~/lib/db.server";
import { CALL_BACK_PROMISE } from "~/lib/requests/options";

export async function loader(_: Route.LoaderArgs) {
  const shop = await getDb()
    .selectFrom("shop")
    .select(["name", "phone"])
    .orderBy("id")
    .limit(1)
    .executeTakeFirst();
  return { shop: shop ?? null };
}

export default function BuildRequestThanks({ loaderData }: Route.ComponentProps) {
  const { shop } = loaderData;
  return (
    <main className="mx-auto max-w-2xl px-4 py-10">
      <h1 className="text-3xl font-semibold text-ink">Thank you — we have your request</h1>
      <p className="mt-3 text-lg text-graphite">
        A confirmation with what you sent is on its way to your e-mail.
      </p>
      <h2 className="mt-6 text-lg font-semibold text-ink">What happens next</h2>
      <ol className="mt-2 list-decimal space-y-2 pl-6 text-graphite">
        <li>{CALL_BACK_PROMISE}</li>
        <li>
          We talk through the bike, what is on it now and what you want, and look at it in the shop
          if needed.
        </li>
        <li>A builder plans the engine package; you get a written quote before any work starts.</li>
      </ol>
      {shop?.phone ? (
        <p className="mt-6 text-graphite">
          Questions before then? Call {shop.name} on <span className="num">{shop.phone}</span>.
        </p>
      ) : null}
      <p className="mt-6">
        <Link to="/build-request" className="text-teal-text underline">
          Send another request
        </Link>
      </p>
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Request received · Torquewright" }];
}
