// A quote's lines and totals, as the staff and the customer read them.
import type { BuiltLine } from "~/lib/quotes/lines";
import type { QuoteTerms, QuoteTotals } from "~/lib/quotes/money";
import { formatCents, formatHundredths, formatPercent } from "~/lib/quotes/display";

const KIND_LABEL: Record<string, string> = {
  part: "Parts",
  labour: "Labour",
  machine: "Machine work",
  supplies: "Shop supplies",
  other: "Other",
};

export function QuoteTable({
  lines,
  totals,
  terms,
  onRemove,
  showSource = true,
}: {
  lines: (BuiltLine | (Omit<BuiltLine, "source" | "slot"> & { source?: string }))[];
  totals: Omit<QuoteTotals, "lines">;
  terms: QuoteTerms;
  /** for the added lines (machine work, other): a control to remove the n-th one */
  onRemove?: (extraIndex: number) => React.ReactNode;
  showSource?: boolean;
}) {
  let extra = -1;
  const rows = [
    ...lines,
    ...(totals.supplies && !lines.some((l) => l.kind === "supplies") ? [totals.supplies] : []),
  ];
  return (
    <div className="mt-3 overflow-hidden rounded border border-steel-200 bg-white">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Quote lines and totals</caption>
        <thead className="hidden bg-steel-100 text-graphite sm:table-header-group">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">
              Line
            </th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">
              Qty
            </th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">
              Each
            </th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">
              Amount
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-steel-200">
          {rows.length === 0 ? (
            <tr>
              <td colSpan={4} className="px-3 py-3 text-steel-700">
                No lines yet: fit parts on the bench, or add machine work below.
              </td>
            </tr>
          ) : null}
          {rows.map((l, i) => {
            const removable = l.kind === "machine" || l.kind === "other";
            if (removable) extra += 1;
            const index = extra;
            return (
              <tr key={i} className="grid grid-cols-2 gap-x-3 px-3 py-2 sm:table-row sm:p-0">
                <td className="col-span-2 sm:px-3 sm:py-2">
                  <span className="text-xs font-semibold uppercase tracking-wide text-steel-700">
                    {KIND_LABEL[l.kind] ?? l.kind}
                  </span>
                  <span className="block text-ink">{l.description}</span>
                  {showSource && "source" in l && l.source ? (
                    <span className="block text-xs text-steel-700">{l.source}</span>
                  ) : null}
                  {removable && onRemove ? onRemove(index) : null}
                </td>
                <td className="whitespace-nowrap tabular-nums sm:px-3 sm:py-2 sm:text-right">
                  <span className="sm:hidden">Qty </span>
                  {formatHundredths(l.quantityHundredths)}
                  {l.kind === "labour" ? " h" : ""}
                </td>
                <td className="text-right tabular-nums sm:px-3 sm:py-2">
                  <span className="sm:hidden">Each </span>
                  {formatCents(l.unitCents)}
                </td>
                <td className="col-span-2 text-right font-semibold tabular-nums sm:col-span-1 sm:px-3 sm:py-2">
                  {formatCents("amountCents" in l ? (l.amountCents as number) : 0)}
                </td>
              </tr>
            );
          })}
        </tbody>
        <tfoot className="border-t-2 border-steel-300 tabular-nums">
          <Total label="Subtotal" cents={totals.subtotalCents} />
          {totals.discountCents > 0 ? (
            <Total
              label={`Discount${terms.discount.kind === "percent" ? ` (${formatPercent(terms.discount.basisPoints)})` : ""}`}
              cents={-totals.discountCents}
            />
          ) : null}
          <Total
            label={`Tax ${formatPercent(terms.taxRateBasisPoints)}${totals.taxableCents ? ` on ${formatCents(totals.taxableCents)}` : ""}`}
            cents={totals.taxCents}
          />
          <Total label="Total" cents={totals.totalCents} strong />
          <Total
            label={`Deposit${terms.deposit.kind === "percent" ? ` (${formatPercent(terms.deposit.basisPoints)} of the total)` : ""}`}
            cents={totals.depositCents}
          />
        </tfoot>
      </table>
      <p className="border-t border-steel-200 px-3 py-2 text-xs text-steel-700">
        Each line is rounded to the cent once; the total is the sum of the lines shown, less the
        discount, plus tax.
      </p>
    </div>
  );
}

function Total({ label, cents, strong }: { label: string; cents: number; strong?: boolean }) {
  return (
    <tr className={strong ? "text-base font-semibold text-ink" : "text-graphite"}>
      <th scope="row" colSpan={3} className="px-3 py-1.5 text-right font-normal">
        {strong ? <strong>{label}</strong> : label}
      </th>
      <td className="px-3 py-1.5 text-right">
        {cents < 0 ? `− ${formatCents(-cents)}` : formatCents(cents)}
      </td>
    </tr>
  );
}
