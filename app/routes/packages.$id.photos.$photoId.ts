import { readForm } from "~/lib/http/body";
// A build photo's changes: on or off the spec sheet, or removed (the builder and owner).
import { data, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.$id.photos.$photoId";
import { requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { deletePhoto, setPhotoOnSheet } from "~/lib/photos/photos.server";

const Intent = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("on-sheet"), onSheet: z.enum(["true", "false"]) }),
  z.object({ intent: z.literal("remove") }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const form = await readForm(request);
  await requireRole(request, "owner", "builder");
  const packageId = requireIdParam(params);
  const photoId = requireIdParam(params, "photoId");
  const parsed = Intent.safeParse(Object.fromEntries(form));
  if (!parsed.success) return data({ ok: false, message: "Unknown change." }, { status: 400 });
  const db = getDb();
  const done =
    parsed.data.intent === "remove"
      ? await deletePhoto(db, packageId, photoId)
      : await setPhotoOnSheet(db, packageId, photoId, parsed.data.onSheet === "true");
  if (!done) throw data("No such photo on this package.", { status: 404 });
  if (request.headers.get("Accept")?.includes("text/html"))
    return redirect(`/packages/${packageId}#photos`);
  return data({ ok: true });
}
