// POST a dyno run file (multipart, sent by the dyno page with upload progress). Answers
// JSON: the stored run, or why nothing was stored.
import type { Route } from "./+types/packages.$id.dyno.upload";
import { requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { uploadRun } from "~/lib/dyno/upload.server";

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, "owner", "builder");
  const id = requireIdParam(params);
  return uploadRun(getDb(), user, id, request);
}
