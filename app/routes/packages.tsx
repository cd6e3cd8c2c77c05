import { queryInt } from "~/lib/http/ids";
import { hasOwnKey } from "~/lib/http/keys";
import { readQuery } from "~/lib/http/text";
import { Form, Link } from "react-router";
import type { Route } from "./+types/packages";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { listPackages, SORTS, type SortKey } from "~/lib/packages/store.server";
import { PACKAGE_STATUSES, type PackageStatus } from "../../db/schema/packages";
import { StatusBadge } from "~/components/packages/status-badge";
import { statusLabel } from "~/lib/format/labels";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "packages:read");
  const db = getDb();
  const p = readQuery(request);
  const statusParam = p.get("status") ?? "";
  const status =
    statusParam === "template" || (PACKAGE_STATUSES as readonly string[]).includes(statusParam)
      ? (statusParam as PackageStatus | "template")
      : null;
  const sortParam = p.get("sort") ?? "updated";
  const sort: SortKey = hasOwnKey(SORTS, sortParam) ? sortParam : "updated";
  const dir: "asc" | "desc" | undefined =
    p.get("dir") === "asc" ? "asc" : p.get("dir") === "desc" ? "desc" : undefined;
  const filters = {
    status,
    customerId: queryInt(p, "customer", { message: "Pick a customer from the list" }),
    builderId: queryInt(p, "builder", { message: "Pick a builder from the list" }),
    sort,
    dir,
    page: queryInt(p, "page", { max: 10_000 }) ?? 1,
  };
  const [list, customers, builders] = await Promise.all([
    listPackages(db, filters),
    db.selectFrom("customers").select(["id", "name"]).orderBy("name").execute(),
    db
      .selectFrom("users")
      .select(["id", "name"])
      .where("role", "in", ["owner", "builder"])
      .orderBy("name")
      .execute(),
  ]);
  return { list, customers, builders, filters, canCreate: can(user.role, "packages:create") };
}

export default function Packages({ loaderData }: Route.ComponentProps) {
  const { list, customers, builders, filters } = loaderData;
  const qs = (over: Record<string, string | number | null>) => {
    const s = new URLSearchParams();
    const all = {
      status: filters.status,
      customer: filters.customerId,
      builder: filters.builderId,
      sort: filters.sort,
      dir: filters.dir ?? null,
      page: filters.page,
      ...over,
    };
    for (const [k, v] of Object.entries(all))
      if (v !== null && v !== undefined && String(v) !== "") s.set(k, String(v));
    return `?${s}`;
  };
  const sortLink = (key: SortKey, label: string) => {
    const active = filters.sort === key;
    const nextDir =
      active && (filters.dir ?? (key === "updated" ? "desc" : "asc")) === "asc" ? "desc" : "asc";
    return (
      <Link
        to={qs({ sort: key, dir: nextDir, page: 1 })}
        className="underline decoration-steel-300 hover:text-ink"
      >
        {label}
        {active ? (nextDir === "asc" ? " ↓" : " ↑") : ""}
        {active ? (
          <span className="sr-only">
            {nextDir === "asc" ? " (sorted high to low)" : " (sorted low to high)"}
          </span>
        ) : null}
      </Link>
    );
  };
  return (
    <main className="mx-auto max-w-7xl px-4 py-6">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-3xl font-semibold text-ink">Packages</h1>
        {loaderData.canCreate ? (
          <Link
            to="/packages/new"
            className="rounded bg-teal-dark px-3 py-1.5 font-semibold text-white hover:bg-ink"
          >
            New package
          </Link>
        ) : null}
      </div>
      <Form
        method="get"
        className="mt-4 flex flex-wrap items-end gap-3 rounded border border-steel-200 bg-white p-3 text-sm"
      >
        <Select
          name="status"
          label="Status"
          value={filters.status ?? ""}
          options={[
            ["", "Any"],
            ...PACKAGE_STATUSES.map((s) => [s, statusLabel(s)] as [string, string]),
            ["template", "shop templates"],
          ]}
        />
        <Select
          name="customer"
          label="Customer"
          value={String(filters.customerId ?? "")}
          options={[
            ["", "Any"],
            ...customers.map((c) => [String(c.id), c.name] as [string, string]),
          ]}
        />
        <Select
          name="builder"
          label="Builder"
          value={String(filters.builderId ?? "")}
          options={[
            ["", "Any"],
            ...builders.map((b) => [String(b.id), b.name] as [string, string]),
          ]}
        />
        <input type="hidden" name="sort" value={filters.sort} />
        <button type="submit" className="rounded bg-ink px-3 py-1.5 font-semibold text-white">
          Filter
        </button>
      </Form>
      <p className="mt-3 text-sm text-steel-700">
        <span className="num">{list.total}</span> package{list.total === 1 ? "" : "s"}
      </p>
      {/* a phone gets one card per package; the table needs the width */}
      <ul className="mt-2 flex flex-col gap-2 sm:hidden" data-testid="package-cards">
        {list.rows.map((r) => (
          <li key={r.id} className="rounded border border-steel-200 bg-white p-3 text-sm">
            <div className="flex items-start justify-between gap-2">
              <Link to={`/packages/${r.id}`} className="font-semibold text-teal-text underline">
                {r.name}
              </Link>
              {r.isTemplate ? (
                <span className="shrink-0 text-steel-700">Shop template</span>
              ) : (
                <StatusBadge status={r.status} />
              )}
            </div>
            {r.isTemplate ? null : (
              <p className="mt-0.5 text-steel-700">
                {r.customerName} · {r.bikeLabel}
              </p>
            )}
            <p className="num mt-0.5 text-steel-700">
              {r.powerHp != null ? `${r.powerHp} hp ${r.powerBasis ?? ""}` : "power not set"} ·{" "}
              {r.builderName ?? "no builder"} · {new Date(r.updatedAt).toLocaleDateString()}
            </p>
          </li>
        ))}
        {list.rows.length === 0 ? (
          <li className="rounded border border-steel-200 bg-white p-3 text-center text-sm text-steel-700">
            No package matches these filters.
          </li>
        ) : null}
      </ul>
      <div className="mt-2 hidden overflow-x-auto rounded border border-steel-200 bg-white sm:block">
        <table className="w-full text-left text-sm">
          <thead className="bg-steel-100 text-xs uppercase tracking-wide text-steel-700">
            <tr>
              <th className="px-3 py-2">{sortLink("name", "Package")}</th>
              <th className="px-3 py-2">{sortLink("customer", "Customer · bike")}</th>
              <th className="px-3 py-2">{sortLink("status", "Status")}</th>
              <th className="px-3 py-2">Power</th>
              <th className="px-3 py-2">Builder</th>
              <th className="px-3 py-2">{sortLink("updated", "Updated")}</th>
            </tr>
          </thead>
          <tbody>
            {list.rows.map((r) => (
              <tr key={r.id} className="border-t border-steel-100">
                <td className="px-3 py-2">
                  <Link to={`/packages/${r.id}`} className="font-semibold text-teal-text underline">
                    {r.name}
                  </Link>
                </td>
                <td className="px-3 py-2">
                  {r.isTemplate ? (
                    <span className="text-steel-700">Shop template</span>
                  ) : (
                    `${r.customerName} · ${r.bikeLabel}`
                  )}
                </td>
                <td className="px-3 py-2">
                  {r.isTemplate ? "—" : <StatusBadge status={r.status} />}
                </td>
                <td className="num px-3 py-2">
                  {r.powerHp != null ? `${r.powerHp} hp ${r.powerBasis ?? ""}` : "—"}
                </td>
                <td className="px-3 py-2">{r.builderName ?? "—"}</td>
                <td className="num px-3 py-2">{new Date(r.updatedAt).toLocaleDateString()}</td>
              </tr>
            ))}
            {list.rows.length === 0 ? (
              <tr>
                <td colSpan={6} className="px-3 py-6 text-center text-steel-700">
                  No package matches these filters.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="mt-3 flex items-center gap-3 text-sm">
        {list.page > 1 ? (
          <Link to={qs({ page: list.page - 1 })} className="underline">
            Previous
          </Link>
        ) : null}
        <span className="num text-steel-700">
          Page {list.page} of {list.pages}
        </span>
        {list.page < list.pages ? (
          <Link to={qs({ page: list.page + 1 })} className="underline">
            Next
          </Link>
        ) : null}
      </nav>
    </main>
  );
}

function Select({
  name,
  label,
  value,
  options,
}: {
  name: string;
  label: string;
  value: string;
  options: [string, string][];
}) {
  return (
    <label className="flex flex-col gap-0.5">
      <span className="text-xs text-steel-700">{label}</span>
      <select
        name={name}
        defaultValue={value}
        className="rounded border border-steel-300 px-2 py-1"
      >
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </label>
  );
}

export function meta() {
  return [{ title: "Packages · Torquewright" }];
}
