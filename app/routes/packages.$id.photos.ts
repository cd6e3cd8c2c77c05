// POST a build photo (multipart, sent with upload progress). Answers JSON.
import type { Route } from "./+types/packages.$id.photos";
import { requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { uploadPhoto } from "~/lib/photos/photos.server";

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, "owner", "builder");
  return uploadPhoto(getDb(), user, requireIdParam(params), request);
}
