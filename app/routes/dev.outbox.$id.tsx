import { data, Link } from "react-router";
import type { Route } from "./+types/dev.outbox.$id";
import { requirePermission } from "~/lib/auth/auth.server";
import { fetchOutbox, requireLocalMail, type OutboxMessage } from "~/lib/mail/outbox.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const base = requireLocalMail();
  await requirePermission(request, "outbox:read");
  const res = await fetchOutbox<OutboxMessage>(base, `/messages/${encodeURIComponent(params.id)}`);
  if (!res.ok)
    throw data(res.status === 404 ? "No caught e-mail has this number." : res.reason, {
      status: res.status === 404 ? 404 : 503,
    });
  return { message: res.value };
}

// Plain text with its web addresses made into links.
function Linkified({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all font-medium text-teal-text underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

export default function OutboxMessageView({ loaderData }: Route.ComponentProps) {
  const m = loaderData.message;
  return (
    <main className="mx-auto max-w-3xl px-4 py-8">
      <Link to="/dev/outbox" className="text-sm font-medium text-teal-text underline">
        ← Outbox
      </Link>
      <h1 className="mt-2 text-2xl font-semibold text-ink">{m.subject || "(no subject)"}</h1>
      <dl className="mt-3 grid grid-cols-[6rem_1fr] gap-y-1 text-sm">
        <dt className="text-steel-700">From</dt>
        <dd>{m.from}</dd>
        <dt className="text-steel-700">To</dt>
        <dd>{m.to.join(", ")}</dd>
        <dt className="text-steel-700">Received</dt>
        <dd className="num">
          {new Date(m.receivedAt).toISOString().replace("T", " ").slice(0, 19)} UTC
        </dd>
      </dl>
      <pre className="mt-6 whitespace-pre-wrap rounded border border-steel-200 bg-white p-4 font-sans text-base text-graphite">
        <Linkified text={m.text} />
      </pre>
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `${data?.message.subject ?? "E-mail"} · Outbox · Torquewright` }];
}
