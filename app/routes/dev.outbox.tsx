import { Link } from "react-router";
import type { Route } from "./+types/dev.outbox";
import { PageHeader } from "~/components/ui/page-header";
import { When } from "~/components/ui/when";
import { requirePermission } from "~/lib/auth/auth.server";
import { fetchOutbox, requireLocalMail, type OutboxSummary } from "~/lib/mail/outbox.server";

export async function loader({ request }: Route.LoaderArgs) {
  const base = requireLocalMail();
  await requirePermission(request, "outbox:read");
  const res = await fetchOutbox<OutboxSummary[]>(base, "/messages");
  return res.ok ? { messages: res.value, problem: null } : { messages: [], problem: res.reason };
}

export default function Outbox({ loaderData }: Route.ComponentProps) {
  const { messages, problem } = loaderData;
  return (
    <main className="mx-auto max-w-5xl px-4 py-8">
      <PageHeader
        eyebrow="Local mail server"
        title="Outbox"
        lead="Every e-mail the app sent while running on this machine. Nothing here left the machine."
      />
      {problem ? (
        <p
          role="alert"
          className="mt-6 rounded border border-amber bg-white px-3 py-2 text-amber-text"
        >
          The local mail server cannot be reached ({problem}). Mail waits in the queue and goes out
          when it is back.
        </p>
      ) : messages.length === 0 ? (
        <p className="mt-6 rounded border border-steel-200 bg-white p-4 text-steel-700">
          No e-mail has been sent yet.
        </p>
      ) : (
        <table className="mt-6 w-full table-fixed border-collapse overflow-hidden rounded border border-steel-200 bg-white text-left text-sm [&_td]:[overflow-wrap:anywhere]">
          <thead className="bg-steel-100 text-steel-700">
            <tr>
              <th className="px-3 py-2 font-semibold">Received (UTC)</th>
              <th className="px-3 py-2 font-semibold">To</th>
              <th className="px-3 py-2 font-semibold">Subject</th>
            </tr>
          </thead>
          <tbody>
            {messages.map((m) => (
              <tr key={m.id} className="border-t border-steel-100">
                <td className="num px-3 py-2 text-steel-700">
                  <When at={m.receivedAt} time />
                </td>
                <td className="px-3 py-2">{m.to.join(", ")}</td>
                <td className="px-3 py-2">
                  <Link to={`/dev/outbox/${m.id}`} className="font-medium text-teal-text underline">
                    {m.subject || "(no subject)"}
                  </Link>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Outbox · Torquewright" }];
}
