import { data } from "react-router";
import type { Route } from "./+types/packages.$id.sheet[.]pdf";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { loadSheet } from "~/lib/sheet/load.server";
import { renderSheetPdf } from "~/lib/sheet/pdf.server";

// GET /packages/:id/sheet.pdf — the spec sheet as a PDF, made on the server.
export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "packages:read");
  const id = requireIdParam(params);
  const sheet = await loadSheet(getDb(), id);
  if (!sheet) throw data("No package with this number.", { status: 404 });
  const pdf = await renderSheetPdf(sheet);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="spec-sheet-${id}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
