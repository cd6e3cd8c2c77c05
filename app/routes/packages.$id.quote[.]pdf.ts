import { readQuery } from "~/lib/http/text";
import { data } from "react-router";
import type { Route } from "./+types/packages.$id.quote[.]pdf";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { requireIdParam } from "~/lib/http/ids";
import { getQuoteSettings, listVersions } from "~/lib/quotes/store.server";
import { loadSheet } from "~/lib/sheet/load.server";
import { renderSheetPdf } from "~/lib/sheet/pdf.server";

// GET /packages/:id/quote.pdf?version=N — a sent quote (the latest when N is not given)
// with the package's spec sheet, as a PDF.
export async function loader({ request, params }: Route.LoaderArgs) {
  await requirePermission(request, "prices:read");
  const id = requireIdParam(params);
  const db = getDb();
  const wanted = readQuery(request).get("version");
  const versions = await listVersions(db, id);
  const v = wanted === null ? versions[0] : versions.find((x) => String(x.number) === wanted);
  const sheet = await loadSheet(db, id);
  if (!v || !sheet) throw data("No sent quote with this number.", { status: 404 });
  const shop = await getQuoteSettings(db);
  const pdf = await renderSheetPdf(sheet, {
    number: v.number,
    lines: v.lines,
    totals: v.totals,
    terms: v.terms,
    customerName: v.customerName,
    shopName: shop.shopName,
  });
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="quote-${id}-${v.number}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
