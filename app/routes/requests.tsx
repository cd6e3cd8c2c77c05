import { readQuery } from "~/lib/http/text";
import { Form, Link } from "react-router";
import type { Route } from "./+types/requests";
import { ageText, RequestStatusBadge } from "~/components/requests/request-status";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { listRequests, type RequestSort } from "~/lib/requests/queue.server";
import { STATUS_LABELS, timeFrameLabel } from "~/lib/requests/options";
import { REQUEST_STATUSES, type RequestStatus } from "../../db/schema/requests";

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "requests:read");
  const query = readQuery(request);
  const rawStatus = query.get("status") ?? "open";
  const status =
    rawStatus === "all"
      ? null
      : rawStatus === "open" || (REQUEST_STATUSES as readonly string[]).includes(rawStatus)
        ? (rawStatus as RequestStatus | "open")
        : "open";
  const sort: RequestSort = query.get("sort") === "time_frame" ? "time_frame" : "age";
  const dir = query.get("dir") === "desc" ? "desc" : "asc";
  const rows = await listRequests(getDb(), { status, sort, dir });
  return { rows, status: status ?? "all", sort, dir, now: Date.now() };
}

const FILTERS = [
  { value: "open", label: "Open" },
  ...REQUEST_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] })),
  { value: "all", label: "All" },
];

export default function Requests({ loaderData }: Route.ComponentProps) {
  const { rows, status, sort, dir, now } = loaderData;
  const sortLink = (key: RequestSort) => {
    const nextDir = sort === key && dir === "asc" ? "desc" : "asc";
    return `?status=${status}&sort=${key}&dir=${nextDir}`;
  };
  const arrow = (key: RequestSort) => (sort === key ? (dir === "asc" ? " ↑" : " ↓") : "");
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <PageHeader
        title="Build requests"
        lead="Riders' requests from the public form, oldest first. Convert one to open a draft package."
        actions={
          <Link to="/build-request" className="text-sm text-teal-text underline">
            The public form
          </Link>
        }
      />
      <Form method="get" className="mt-4 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor="status" className="block text-sm font-semibold text-graphite">
            Show
          </label>
          <select
            id="status"
            name="status"
            defaultValue={status}
            className="mt-1 rounded border border-steel-300 bg-white px-2 py-1.5"
          >
            {FILTERS.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label}
              </option>
            ))}
          </select>
        </div>
        <input type="hidden" name="sort" value={sort} />
        <input type="hidden" name="dir" value={dir} />
        <button
          type="submit"
          className="rounded border border-steel-300 bg-white px-3 py-1.5 font-medium"
        >
          Filter
        </button>
      </Form>
      {rows.length === 0 ? (
        <p className="mt-6 text-steel-700">No requests here.</p>
      ) : (
        <div className="mt-4 overflow-x-auto rounded border border-steel-200 bg-white">
          <table className="w-full min-w-[44rem] text-left text-sm">
            <thead className="bg-steel-50 text-steel-700">
              <tr>
                <th className="px-3 py-2">Rider</th>
                <th className="px-3 py-2">Bike</th>
                <th className="px-3 py-2">
                  <Link to={sortLink("time_frame")} className="underline">
                    Time frame{arrow("time_frame")}
                  </Link>
                </th>
                <th className="px-3 py-2">Status</th>
                <th className="px-3 py-2">Last change by</th>
                <th className="px-3 py-2 text-right">
                  <Link to={sortLink("age")} className="underline">
                    Waiting{arrow("age")}
                  </Link>
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-steel-100">
                  <td className="px-3 py-2">
                    <Link
                      to={`/requests/${r.id}`}
                      className="font-semibold text-teal-text underline"
                    >
                      {r.name}
                    </Link>
                    <span className="ml-1 text-steel-700">#{r.id}</span>
                  </td>
                  <td className="px-3 py-2">
                    {r.bike}
                    {r.family ? <span className="block text-steel-700">{r.family}</span> : null}
                  </td>
                  <td className="px-3 py-2">{timeFrameLabel(r.timeFrame)}</td>
                  <td className="px-3 py-2">
                    <RequestStatusBadge status={r.status} />
                  </td>
                  <td className="px-3 py-2">{r.changedBy}</td>
                  <td className="num px-3 py-2 text-right">{ageText(r.createdAt, now)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Build requests · Torquewright" }];
}
