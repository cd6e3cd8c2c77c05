import { queryInt } from "~/lib/http/ids";
import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/parts";
import { formatMoney } from "~/lib/format";
import { buttonClass } from "~/components/ui/button";
import { controlClass, Field } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import {
  addCategory,
  categoryOptions,
  partForRole,
  PART_SORTS,
  searchParts,
  type PartSort,
} from "~/lib/catalog/parts.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requirePermission(request, "parts:read");
  const p = readQuery(request);
  const sort = (PART_SORTS as readonly string[]).includes(p.get("sort") ?? "")
    ? (p.get("sort") as PartSort)
    : "part_number";
  const showPrices = can(user.role, "prices:read");
  const search = {
    q: (p.get("q") ?? "").slice(0, 100),
    category: (p.get("category") ?? "").slice(0, 60),
    archived: p.get("archived") === "1",
    sort: !showPrices && sort === "price" ? ("part_number" as const) : sort,
    dir: p.get("dir") === "desc" ? ("desc" as const) : ("asc" as const),
    page: queryInt(p, "page", { max: 10_000 }) ?? 1,
  };
  const db = getDb();
  const [found, categories] = await Promise.all([
    searchParts(db, { ...search, category: search.category || undefined }),
    categoryOptions(db),
  ]);
  return {
    search,
    showPrices,
    canEdit: can(user.role, "parts:edit"),
    categories,
    total: found.total,
    pages: found.pages,
    rows: found.rows.map((r) => {
      const x = partForRole(r, showPrices);
      return {
        id: x.id,
        part_number: x.part_number,
        category: x.category,
        maker: x.maker,
        name: x.name,
        price_cents: x.price_cents,
        labour_hours: Number(x.labour_hours),
        tags: x.tags,
        stock: x.stock,
        archived: x.archived_at !== null,
      };
    }),
  };
}

const CategorySchema = z.object({
  label: z
    .string({ error: "Name the category" })
    .trim()
    .min(2, "Name the category")
    .max(60, "Keep it under 60 characters"),
});

export async function action({ request }: Route.ActionArgs) {
  await requirePermission(request, "parts:edit");
  const submission = parseWithZod(await readForm(request), { schema: CategorySchema });
  if (submission.status !== "success")
    return data({ result: submission.reply(), added: null }, { status: 400 });
  const r = await addCategory(getDb(), submission.value.label);
  if ("error" in r)
    return data(
      { result: submission.reply({ fieldErrors: { label: [r.error] } }), added: null },
      { status: 400 },
    );
  return { result: submission.reply({ resetForm: true }), added: r.slug };
}

export default function Parts({ loaderData, actionData }: Route.ComponentProps) {
  const { rows, search, categories, total, pages, showPrices, canEdit } = loaderData;
  const labelOf = new Map(categories.map((c) => [c.value, c.label]));
  const link = (over: Record<string, string | number | boolean>) => {
    const q = new URLSearchParams();
    const merged = { ...search, ...over } as Record<string, unknown>;
    for (const [k, v] of Object.entries(merged)) {
      if (v === "" || v === false || v === undefined || (k === "page" && v === 1)) continue;
      q.set(k, v === true ? "1" : String(v));
    }
    return `/parts?${q}`;
  };
  const sortHeader = (key: PartSort, label: string, right = false) => {
    const active = search.sort === key;
    const dir = active && search.dir === "asc" ? "desc" : "asc";
    return (
      <th
        className={`px-3 py-2 ${right ? "text-right" : ""}`}
        aria-sort={active ? (search.dir === "asc" ? "ascending" : "descending") : "none"}
      >
        <Link to={link({ sort: key, dir, page: 1 })} className="underline decoration-steel-300">
          {label}
          {active ? (search.dir === "asc" ? " ▲" : " ▼") : ""}
        </Link>
      </th>
    );
  };
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        title="Parts catalog"
        lead="The parts shelf the bench draws from. Archived parts stay readable on the packages that used them."
        actions={
          <>
            <a href="/parts/export.csv" className={buttonClass("quiet")}>
              Export CSV
            </a>
            {canEdit ? (
              <>
                <Link to="/parts/import" className={buttonClass("quiet")}>
                  Import CSV
                </Link>
                <Link to="/parts/new" className={buttonClass()}>
                  New part
                </Link>
              </>
            ) : null}
          </>
        }
      />
      <Form
        method="get"
        className="mt-6 flex flex-wrap items-end gap-3 rounded border border-steel-200 bg-white p-3"
      >
        <div className="min-w-56 flex-1">
          <label htmlFor="q" className="block text-sm font-semibold text-graphite">
            Search number, name, maker or tag
          </label>
          <input
            id="q"
            name="q"
            defaultValue={search.q}
            className="mt-1 block w-full rounded border border-steel-300 px-3 py-2"
          />
        </div>
        <div>
          <label htmlFor="category" className="block text-sm font-semibold text-graphite">
            Category
          </label>
          <select
            id="category"
            name="category"
            defaultValue={search.category}
            className="mt-1 block rounded border border-steel-300 bg-white px-2 py-2"
          >
            <option value="">All</option>
            {categories.map((c) => (
              <option key={c.value} value={c.value}>
                {c.label}
              </option>
            ))}
          </select>
        </div>
        <label className="flex items-center gap-2 pb-2 text-sm font-semibold text-graphite">
          <input
            type="checkbox"
            name="archived"
            value="1"
            defaultChecked={search.archived}
            className="h-4 w-4 accent-teal"
          />{" "}
          Show archived
        </label>
        <input type="hidden" name="sort" value={search.sort} />
        <input type="hidden" name="dir" value={search.dir} />
        <button
          type="submit"
          className="rounded bg-teal-dark px-4 py-2 font-semibold text-white hover:bg-ink"
        >
          Search
        </button>
      </Form>
      <p className="mt-3 text-sm text-steel-700" aria-live="polite">
        <span className="num">{total}</span> part{total === 1 ? "" : "s"}
      </p>
      <div className="mt-2 overflow-x-auto rounded border border-steel-200 bg-white">
        <table className="w-full text-sm">
          <thead className="bg-steel-100 text-left text-graphite">
            <tr>
              {sortHeader("part_number", "Part number")}
              {sortHeader("name", "Name")}
              {sortHeader("category", "Category")}
              {sortHeader("maker", "Maker")}
              <th className="px-3 py-2">Tags</th>
              {showPrices ? sortHeader("price", "Price", true) : null}
              <th className="px-3 py-2 text-right">Labour</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr
                key={r.id}
                className={`border-t border-steel-100 align-top ${r.archived ? "text-steel-700" : ""}`}
              >
                <td className="px-3 py-2 font-mono">
                  <Link to={`/parts/${r.id}`} className="font-semibold text-ink underline">
                    {r.part_number}
                  </Link>
                </td>
                <td className="px-3 py-2">
                  {r.name}
                  {r.stock ? (
                    <span className="ml-2 rounded border border-steel-300 px-1 text-xs text-steel-700">
                      stock
                    </span>
                  ) : null}
                  {r.archived ? (
                    <span className="ml-2 rounded border border-steel-300 px-1 text-xs text-steel-700">
                      archived
                    </span>
                  ) : null}
                </td>
                <td className="px-3 py-2">{labelOf.get(r.category) ?? r.category}</td>
                <td className="px-3 py-2">{r.maker}</td>
                <td className="px-3 py-2 font-mono text-xs text-steel-700">{r.tags.join(" ")}</td>
                {showPrices ? (
                  <td className="num px-3 py-2 text-right">
                    {r.price_cents === null ? "" : formatMoney(r.price_cents)}
                  </td>
                ) : null}
                <td className="num px-3 py-2 text-right">{r.labour_hours} h</td>
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={7} className="px-3 py-6 text-center text-steel-700">
                  No part matches. Clear the search or the category.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      {pages > 1 ? (
        <nav aria-label="Pages" className="mt-3 flex items-center gap-3 text-sm">
          {search.page > 1 ? (
            <Link to={link({ page: search.page - 1 })} className="text-teal-text underline">
              ← Previous
            </Link>
          ) : null}
          <span className="num">
            Page {search.page} of {pages}
          </span>
          {search.page < pages ? (
            <Link to={link({ page: search.page + 1 })} className="text-teal-text underline">
              Next →
            </Link>
          ) : null}
        </nav>
      ) : null}
      {canEdit ? (
        <Form
          method="post"
          className="mt-8 flex max-w-xl flex-wrap items-end gap-3 rounded border border-steel-200 bg-white p-3"
        >
          <div className="flex-1">
            <Field
              id="label"
              label="Add a category"
              hint="A category the shop adds carries no measurements; its parts are found by number, name, maker and tags."
              errorId="label-error"
              errors={actionData?.result?.error?.label}
            >
              <input
                id="label"
                name="label"
                aria-invalid={actionData?.result?.error?.label ? true : undefined}
                aria-describedby={
                  actionData?.result?.error?.label ? "label-error label-hint" : "label-hint"
                }
                className={controlClass(actionData?.result?.error?.label)}
              />
            </Field>
            {actionData?.added ? (
              <p role="status" className="mt-1 text-sm text-green-text">
                Added “{actionData.added}”.
              </p>
            ) : null}
          </div>
          <button type="submit" className={buttonClass("secondary")}>
            Add
          </button>
        </Form>
      ) : null}
    </main>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Parts catalog · Torquewright" }];
}
