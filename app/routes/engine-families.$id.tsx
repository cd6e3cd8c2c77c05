import { readForm } from "~/lib/http/body";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/engine-families.$id";
import { FamilyForm } from "~/components/engine-families/family-form";
import { when } from "~/components/requests/request-status";
import { Notice } from "~/components/ui/alert";
import { PageHeader, Section } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { can } from "~/lib/auth/permissions";
import { getDb } from "~/lib/db.server";
import { familyHistory, getFamily, updateFamily } from "~/lib/engine-families/families.server";
import { familyYears, type FamilyInput } from "~/lib/engine-families/family";
import { partOptions, saveFamilyForm } from "~/lib/engine-families/form-actions.server";
import { requireIdParam } from "~/lib/http/ids";
import { SLOTS } from "~/lib/packages/slots";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requirePermission(request, "families:read");
  const id = requireIdParam(params);
  const db = getDb();
  const family = await getFamily(db, id);
  if (!family) throw data("Not found", { status: 404 });
  const [history, parts] = await Promise.all([familyHistory(db, id), partOptions(db)]);
  return { family, history, parts, canEdit: can(user.role, "families:edit") };
}

export async function action({ request, params }: Route.ActionArgs) {
  const formData = await readForm(request);
  const user = await requirePermission(request, "families:edit");
  const id = requireIdParam(params);
  const db = getDb();
  const family = await getFamily(db, id);
  if (!family) throw data("Not found", { status: 404 });
  if (formData.get("intent") === "archive" || formData.get("intent") === "restore") {
    const input = {
      name: family.name,
      yearFrom: family.yearFrom,
      yearTo: family.yearTo ?? undefined,
      boreMm: family.boreMm,
      strokeMm: family.strokeMm,
      displacementCc: family.displacementCc,
      deckHeightMm: family.deckHeightMm ?? undefined,
      revLimitRpm: family.revLimitRpm ?? undefined,
      notes: family.notes,
      ...Object.fromEntries(Object.entries(family.stockParts).map(([k, v]) => [`stock_${k}`, v])),
    } as unknown as FamilyInput;
    await updateFamily(db, id, input, user.id, { archive: formData.get("intent") === "archive" });
    return {
      result: null,
      saved: formData.get("intent") === "archive" ? "Archived." : "Restored.",
    };
  }
  const out = await saveFamilyForm(db, formData, user.id, id);
  if (!out.ok) return data({ result: out.result, saved: null }, { status: 400 });
  return { result: out.result, saved: "Saved as a new version." };
}

export default function FamilyPage({ loaderData, actionData }: Route.ComponentProps) {
  const { family: f, history, parts, canEdit } = loaderData;
  const busy = useNavigation().state !== "idle";
  const partLabel = new Map(parts.map((p) => [p.value, p.label]));
  const defaults: Record<string, string> = {
    name: f.name,
    yearFrom: String(f.yearFrom),
    yearTo: f.yearTo !== null ? String(f.yearTo) : "",
    boreMm: String(f.boreMm),
    strokeMm: String(f.strokeMm),
    displacementCc: String(f.displacementCc),
    deckHeightMm: f.deckHeightMm !== null ? String(f.deckHeightMm) : "",
    revLimitRpm: f.revLimitRpm !== null ? String(f.revLimitRpm) : "",
    notes: f.notes,
    ...Object.fromEntries(
      SLOTS.map((s) => [`stock_${s.key}`, f.stockParts[s.key] ? String(f.stockParts[s.key]) : ""]),
    ),
  };
  return (
    <main className="mx-auto max-w-6xl px-4 py-6">
      <PageHeader
        back={{ to: "/engine-families", label: "Engine families" }}
        eyebrow={`Engine family · version ${f.version}${f.archived ? " · archived" : ""}`}
        title={f.name}
        lead={`${familyYears(f)} · ${f.boreMm} × ${f.strokeMm} mm · ${f.displacementCc} cc`}
      />
      {actionData?.saved ? <Notice className="mt-4">{actionData.saved}</Notice> : null}
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_20rem]">
        {canEdit ? (
          <FamilyForm
            key={f.version}
            defaults={defaults}
            parts={parts}
            lastResult={actionData?.result}
            busy={busy}
            submitLabel="Save a new version"
          />
        ) : (
          <Section id="stock" title="Stock parts">
            <ul className="rounded border border-steel-200 bg-white p-4 text-sm">
              {SLOTS.map((s) => (
                <li key={s.key}>
                  {s.label}:{" "}
                  {f.stockParts[s.key] ? partLabel.get(String(f.stockParts[s.key])) : "—"}
                </li>
              ))}
            </ul>
          </Section>
        )}
        <aside className="space-y-6">
          {canEdit ? (
            <Form method="post">
              <input type="hidden" name="intent" value={f.archived ? "restore" : "archive"} />
              <button
                type="submit"
                className="rounded border border-steel-300 bg-white px-3 py-1.5 font-medium"
              >
                {f.archived ? "Restore the family" : "Archive the family"}
              </button>
            </Form>
          ) : null}
          <Section id="history" title="Versions">
            <ol className="space-y-1 text-sm">
              {history.map((h) => (
                <li key={h.version}>
                  v{h.version} · {when(h.at)} · {h.by ?? "seed"}: {h.change}
                </li>
              ))}
            </ol>
          </Section>
        </aside>
      </div>
    </main>
  );
}

export function meta({ data: d }: Route.MetaArgs) {
  return [{ title: `${d?.family?.name ?? "Engine family"} · Torquewright` }];
}
