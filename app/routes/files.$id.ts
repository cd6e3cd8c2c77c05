// Stored files (dyno run files, build photos and their thumbnails) are read only through
// here: the role check first, then the object streamed from the private bucket.
import { data } from "react-router";
import type { Route } from "./+types/files.$id";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { getObjectStream } from "~/lib/storage/storage.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "packages:read");
  const id = requireIdParam(params);
  const file = await getDb()
    .selectFrom("stored_files")
    .select(["object_key", "content_type", "byte_size", "original_name", "kind", "sha256"])
    .where("id", "=", id)
    .executeTakeFirst();
  if (!file) throw data("No such file.", { status: 404 });
  const body = await getObjectStream(file.object_key);
  if (!body) throw data("The file is missing from storage.", { status: 404 });
  const inline = file.kind !== "dyno_run";
  const name = file.original_name.replace(/[^\w.\- ]/g, "_");
  return new Response(body, {
    headers: {
      "Content-Type": file.content_type,
      "Content-Length": String(file.byte_size),
      "Content-Disposition": `${inline ? "inline" : "attachment"}; filename="${name}"`,
      "Cache-Control": "private, max-age=300",
      "X-Content-Type-Options": "nosniff",
      ETag: `"${file.sha256}"`,
    },
  });
}
