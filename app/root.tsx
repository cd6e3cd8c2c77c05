import {
  isRouteErrorResponse,
  Links,
  Meta,
  Outlet,
  Scripts,
  ScrollRestoration,
  useRouteLoaderData,
} from "react-router";
import type { Route } from "./+types/root";
import { AppHeader } from "./components/shell/app-header";
import { getUser } from "./lib/auth/auth.server";
import { getDb } from "./lib/db.server";
import { env } from "./lib/env.server";
import { DEFAULT_TIME_ZONE } from "./lib/format";
import { getShopTimeZone } from "./lib/settings/shop-settings.server";
import { ensureJobWorkers } from "./lib/mail/workers.server";
import "./app.css";
import { z } from "zod";

// In the browser, Zod must not probe for eval (`Function("")`): the page's
// Content-Security-Policy forbids it, and each probe would be reported as a violation.
if (typeof document !== "undefined") z.config({ jitless: true });

export async function loader({ request }: Route.LoaderArgs) {
  // The first request a server answers starts its share of the job queue.
  ensureJobWorkers();
  const user = await getUser(request);
  // every screen writes dates in the shop's time zone
  const timeZone = user ? await getShopTimeZone(getDb()) : DEFAULT_TIME_ZONE;
  return { user, localMail: Boolean(env().LOCAL_MAIL_API_URL), timeZone };
}

export function Layout({ children }: { children: React.ReactNode }) {
  const data = useRouteLoaderData<typeof loader>("root");
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <link rel="icon" href="/favicon.svg" type="image/svg+xml" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen bg-steel-50 text-graphite antialiased">
        <AppHeader user={data?.user ?? null} localMail={data?.localMail ?? false} />
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let status = 500;
  let title = "Something went wrong";
  let detail =
    "The shop's server hit an error it did not expect. Try again; if it keeps happening, tell the owner.";
  let stack: string | undefined;

  if (isRouteErrorResponse(error)) {
    status = error.status;
    if (error.status === 404) {
      title = "Page not found";
      detail = "Nothing lives at this address. Check the link, or start again from the home page.";
    } else if (error.status === 403) {
      title = "Not for your role";
      detail =
        typeof error.data === "string" && error.data
          ? error.data
          : "Your account's role does not include this page.";
    } else if (error.status === 503) {
      title = "The database is not reachable";
      detail =
        typeof error.data === "string" && error.data
          ? error.data
          : "The shop's database is not answering. Try again in a moment.";
    } else {
      title = error.statusText || title;
      if (typeof error.data === "string" && error.data) detail = error.data;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
    stack = error.stack;
  }

  return (
    <main className="mx-auto max-w-3xl px-4 py-16">
      <title>{`${title} · Torquewright`}</title>
      <p className="num text-sm font-semibold uppercase tracking-widest text-steel-700">
        Error {status}
      </p>
      <h1 className="mt-2 text-3xl font-semibold text-ink">{title}</h1>
      <p className="mt-4 text-lg text-steel-700">{detail}</p>
      <a
        href="/"
        className="mt-8 inline-block rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink"
      >
        Back to the home page
      </a>
      {stack ? (
        <pre className="mt-8 overflow-x-auto rounded border border-steel-200 bg-white p-4 text-xs text-steel-700">
          {stack}
        </pre>
      ) : null}
    </main>
  );
}
