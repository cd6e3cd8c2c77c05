import { z } from "zod";
import type { Route } from "./+types/api.calc";
import { requireApiPermission } from "~/lib/auth/api.server";
import { readJson } from "~/lib/http/body";
import { computeSpec, SPEC_FIELDS, THRESHOLD_KEYS } from "../../calc";

// POST /api/calc — a spec (JSON, calc's field names in mm, cc, ° and rpm) in, figures out.
// Only calc's own field and threshold names are read; any other key (also `__proto__`,
// `constructor`, …) is "not a spec field".
const numberOrNull = z.number({ error: "must be a number" }).finite().nullable().optional();
const SpecBody = z
  .object(
    Object.fromEntries(SPEC_FIELDS.map((f) => [f, numberOrNull])) as Record<
      (typeof SPEC_FIELDS)[number],
      typeof numberOrNull
    >,
  )
  .extend({
    thresholds: z
      .object(Object.fromEntries(THRESHOLD_KEYS.map((k) => [k, numberOrNull])))
      .strict()
      .optional(),
  })
  .strict();

/** Errors by field, kept in a Map so no key the caller sends can reach an inherited name. */
function collect(pairs: [string, string][]) {
  const m = new Map<string, string[]>();
  for (const [k, v] of pairs) m.set(k, [...(m.get(k) ?? []), v]);
  return Object.fromEntries(m);
}

export async function action({ request }: Route.ActionArgs) {
  await requireApiPermission(request, "library:read");
  if (request.method !== "POST")
    return Response.json({ error: "Use POST with a JSON body." }, { status: 405 });
  const body = await readJson(request);
  if (!body.ok)
    return Response.json(
      { error: body.error, fieldErrors: { spec: ["must be a JSON object"] } },
      { status: body.status },
    );
  const parsed = SpecBody.safeParse(body.value);
  if (!parsed.success) {
    const fieldErrors = collect(
      parsed.error.issues.flatMap((i): [string, string][] =>
        i.code === "unrecognized_keys"
          ? i.keys.map((k) => [[...i.path, k].join("."), "is not a spec field"])
          : [[i.path.join(".") || "spec", i.path.length ? i.message : "must be a JSON object"]],
      ),
    );
    return Response.json(
      { error: "The spec has fields that cannot be used.", fieldErrors },
      { status: 400 },
    );
  }
  const out = computeSpec(parsed.data);
  if (!out.ok) {
    const fieldErrors = collect(out.errors.map((e) => [e.field, e.message]));
    return Response.json({ error: "The spec cannot be computed.", fieldErrors }, { status: 400 });
  }
  return Response.json({
    results: out.results,
    cautions: out.cautions,
    steps: out.steps,
    missing: out.missing,
  });
}

export async function loader({ request }: Route.LoaderArgs) {
  await requireApiPermission(request, "library:read");
  return Response.json({ error: "Use POST with a JSON spec body." }, { status: 405 });
}
