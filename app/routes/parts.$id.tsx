import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { parseId } from "~/lib/http/ids";
import { data, Form } from "react-router";
import type { Route } from "./+types/parts.$id";
import { formatMoney } from "~/lib/format";
import { PartHistory } from "~/components/catalog/history";
import { PartForm } from "~/components/catalog/part-form";
import { Caution, Notice } from "~/components/ui/alert";
import { buttonClass } from "~/components/ui/button";
import { PageHeader, Section } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { categoryOptions, getPart, getPartHistory } from "~/lib/catalog/parts.server";
import { getDb } from "~/lib/db.server";
import { handleArchive, handlePartSave } from "~/lib/catalog/part-actions.server";
import { attributeFieldsFor, unitText } from "~/lib/catalog/attributes";
import { can } from "~/lib/auth/permissions";

async function findPart(id: string | undefined) {
  const pid = parseId(id);
  const part = pid === null ? null : await getPart(getDb(), pid);
  if (!part) throw data("No part with this number.", { status: 404 });
  return part;
}

const iso = (d: unknown) => new Date(d as string).toISOString();

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "parts:read");
  const part = await findPart(params.id);
  const db = getDb();
  const showPrices = can(user.role, "prices:read");
  const [history, categories] = await Promise.all([
    getPartHistory(db, part.id),
    categoryOptions(db),
  ]);
  return {
    canEdit: can(user.role, "parts:edit"),
    showPrices,
    saved: readQuery(request).get("saved"),
    categories,
    part: {
      id: part.id,
      part_number: part.part_number,
      category: part.category,
      maker: part.maker,
      name: part.name,
      price_cents: showPrices ? part.price_cents : null,
      labour_hours: Number(part.labour_hours),
      tags: part.tags,
      stock: part.stock,
      attributes: part.attributes,
      notes: part.notes,
      version: part.version,
      archived_at: part.archived_at ? iso(part.archived_at) : null,
    },
    history: history.map((h) => {
      const snap = { ...(h.snapshot as Record<string, unknown>) };
      if (!showPrices) delete snap.price_cents; // apprentices never receive prices, not even in the history
      return {
        version: h.version,
        change: h.change,
        changed_at: iso(h.changed_at),
        changed_by_name: h.changed_by_name,
        snapshot: snap,
      };
    }),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requirePermission(request, "parts:edit");
  const part = await findPart(params.id);
  const formData = await readForm(request);
  const intent = String(formData.get("intent") ?? "save");
  if (intent === "archive" || intent === "restore")
    return handleArchive(part.id, intent === "archive", user);
  return handlePartSave(formData, user, part.id);
}

export default function PartPage({ loaderData }: Route.ComponentProps) {
  const { part, history, canEdit, showPrices, categories, saved } = loaderData;
  const label = categories.find((c) => c.value === part.category)?.label ?? part.category;
  const attrs = part.attributes as Record<string, number>;
  return (
    <main className="mx-auto max-w-7xl px-4 py-8">
      <PageHeader
        back={{ to: "/parts", label: "Parts catalog" }}
        title={
          <>
            <span className="font-mono">{part.part_number}</span> · {part.name}
          </>
        }
        lead={
          <>
            {label} · {part.maker} · version <span className="num">{part.version}</span>
            {part.stock ? " · stock part" : ""}
          </>
        }
      />
      {part.archived_at ? (
        <Caution className="mt-3 font-medium">
          Archived: hidden from the parts shelf; packages that used it still show it.
        </Caution>
      ) : null}
      {saved ? <Notice className="mt-3">Saved as version {saved}.</Notice> : null}
      <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_24rem]">
        <div className="space-y-6">
          <section className="rounded border border-steel-200 bg-white p-4 text-sm">
            <dl className="grid grid-cols-[12rem_1fr] gap-y-1">
              {showPrices ? (
                <>
                  <dt className="text-steel-700">Price</dt>
                  <dd className="num text-ink">{formatMoney(part.price_cents ?? 0)}</dd>
                </>
              ) : null}
              <dt className="text-steel-700">Labour</dt>
              <dd className="num text-ink">{part.labour_hours} h</dd>
              <dt className="text-steel-700">Tags</dt>
              <dd className="font-mono text-ink">{part.tags.join(" ") || "—"}</dd>
              {attributeFieldsFor(part.category).map((f) => (
                <div key={f.key} className="contents">
                  <dt className="text-steel-700">{f.label}</dt>
                  <dd className="num text-ink">
                    {attrs[f.key] === undefined ? "—" : `${attrs[f.key]} ${unitText(f.unit)}`}
                  </dd>
                </div>
              ))}
              {part.notes ? (
                <>
                  <dt className="text-steel-700">Notes</dt>
                  <dd className="text-ink">{part.notes}</dd>
                </>
              ) : null}
            </dl>
            <p className="mt-3 text-xs text-steel-700">
              Fit and torque every part to its maker's instructions.
            </p>
          </section>
          {canEdit ? (
            <Section id="edit-h" title="Change this part">
              <PartForm
                key={part.version}
                editing
                categories={categories}
                defaults={{
                  part_number: part.part_number,
                  category: part.category,
                  maker: part.maker,
                  name: part.name,
                  price: ((part.price_cents ?? 0) / 100).toFixed(2),
                  labour_hours: String(part.labour_hours),
                  tags: part.tags.join(", "),
                  stock: part.stock,
                  notes: part.notes,
                  attributes: Object.fromEntries(
                    Object.entries(attrs).map(([k, v]) => [k, String(v)]),
                  ),
                  version: part.version,
                }}
              />
              <Form method="post" className="mt-3">
                <input
                  type="hidden"
                  name="intent"
                  value={part.archived_at ? "restore" : "archive"}
                />
                <button type="submit" className={buttonClass("quiet")}>
                  {part.archived_at ? "Restore to the shelf" : "Archive (hide from the shelf)"}
                </button>
              </Form>
            </Section>
          ) : null}
        </div>
        <Section as="aside" id="hist-h" title="History">
          <PartHistory versions={history} />
        </Section>
      </div>
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `${data?.part.part_number ?? "Part"} · Torquewright` }];
}
