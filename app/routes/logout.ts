import { redirect } from "react-router";
import type { Route } from "./+types/logout";
import { getDb } from "~/lib/db.server";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { destroySession } from "~/lib/auth/session.server";

// Signing out is a POST from our own pages; a GET only shows where to go.
export async function loader(_: Route.LoaderArgs) {
  return redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  requireSameOrigin(request);
  const setCookie = await destroySession(getDb(), request);
  return redirect("/login", { headers: { "Set-Cookie": setCookie } });
}
