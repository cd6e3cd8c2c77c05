import { z } from "zod";
import type { Route } from "./+types/api.calc";
import { requireApiPermission } from "~/lib/auth/api.server";
import { computeSpec, SPEC_FIELDS } from "../../calc";

// POST /api/calc — a spec (JSON, calc's field names in mm, cc, ° and rpm) in, figures out.
const numberOrNull = z.number({ error: "must be a number" }).finite().nullable().optional();
const SpecBody = z
  .object(
    Object.fromEntries(SPEC_FIELDS.map((f) => [f, numberOrNull])) as Record<
      (typeof SPEC_FIELDS)[number],
      typeof numberOrNull
    >,
  )
  .extend({ thresholds: z.record(z.string(), z.number().finite().nullable()).optional() })
  .strict();

export async function action({ request }: Route.ActionArgs) {
  await requireApiPermission(request, "library:read");
  if (request.method !== "POST")
    return Response.json({ error: "Use POST with a JSON body." }, { status: 405 });
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return Response.json(
      { error: "The body is not JSON.", fieldErrors: { spec: ["must be a JSON object"] } },
      { status: 400 },
    );
  }
  const parsed = SpecBody.safeParse(body);
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const i of parsed.error.issues) {
      const key = i.code === "unrecognized_keys" ? i.keys.join(",") : i.path.join(".") || "spec";
      (fieldErrors[key] ??= []).push(
        i.code === "unrecognized_keys" ? "is not a spec field" : i.message,
      );
    }
    return Response.json(
      { error: "The spec has fields that cannot be used.", fieldErrors },
      { status: 400 },
    );
  }
  const out = computeSpec(parsed.data);
  if (!out.ok) {
    const fieldErrors: Record<string, string[]> = {};
    for (const e of out.errors) (fieldErrors[e.field] ??= []).push(e.message);
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
