// The spec sheet (and a quote) as a PDF, made on the server with the shop's font.
import { createRequire } from "node:module";
import { Document, Font, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import type { BuiltLine } from "../quotes/lines";
import type { QuoteTerms, QuoteTotals } from "../quotes/money";
import { formatCents, formatHundredths, formatPercent } from "../quotes/display";
import type { SheetModel } from "./model";

const require = createRequire(import.meta.url);
let registered = false;
function registerFont() {
  if (registered) return;
  Font.register({
    family: "Barlow",
    fonts: [
      {
        src: require.resolve("@fontsource/barlow/files/barlow-latin-400-normal.woff"),
        fontWeight: 400,
      },
      {
        src: require.resolve("@fontsource/barlow/files/barlow-latin-600-normal.woff"),
        fontWeight: 600,
      },
    ],
  });
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}

const s = StyleSheet.create({
  page: { fontFamily: "Barlow", fontSize: 9, padding: 32, color: "#1f2933" },
  title: { fontSize: 16, fontWeight: 600, color: "#0d1b2a" },
  sub: { marginTop: 2, color: "#46525e" },
  h2: { marginTop: 12, marginBottom: 4, fontSize: 11, fontWeight: 600, color: "#0d1b2a" },
  row: {
    flexDirection: "row",
    borderBottomWidth: 0.5,
    borderBottomColor: "#c5ced8",
    paddingVertical: 2,
  },
  cellWide: { flex: 3 },
  cell: { flex: 1.2, textAlign: "right" },
  strong: { fontWeight: 600 },
  box: { marginTop: 10, padding: 6, borderWidth: 0.8, borderColor: "#d89614" },
  note: { color: "#46525e", marginTop: 2 },
});

export type QuoteForPdf = {
  number: number;
  lines: (Omit<BuiltLine, "source" | "slot"> & { amountCents?: number })[];
  totals: Omit<QuoteTotals, "lines">;
  terms: QuoteTerms;
  customerName: string;
  shopName: string;
};

export async function renderSheetPdf(model: SheetModel, quote?: QuoteForPdf): Promise<Buffer> {
  registerFont();
  return renderToBuffer(
    <Document
      title={quote ? `Quote ${quote.number} — ${model.title}` : `Spec sheet — ${model.title}`}
    >
      <Page size="LETTER" style={s.page}>
        <Text style={s.title}>{quote ? `Quote ${quote.number}: ${model.title}` : model.title}</Text>
        <Text style={s.sub}>{model.subtitle}</Text>
        {quote ? <QuotePart quote={quote} /> : null}
        <Text style={s.h2}>The numbers</Text>
        <View style={s.row}>
          <Text style={[s.cellWide, s.strong]}>Figure</Text>
          <Text style={[s.cell, s.strong]}>Inch</Text>
          <Text style={[s.cell, s.strong]}>Metric</Text>
        </View>
        {model.figures.map((f) => (
          <View style={s.row} key={f.label}>
            <Text style={s.cellWide}>{f.label}</Text>
            <Text style={s.cell}>{f.inch}</Text>
            <Text style={s.cell}>{f.metric}</Text>
          </View>
        ))}
        <Text style={s.h2}>Parts by slot</Text>
        {model.slots.map((slot) => (
          <View style={s.row} key={slot.label} wrap={false}>
            <Text style={[s.cell, { textAlign: "left" }, s.strong]}>{slot.label}</Text>
            <View style={s.cellWide}>
              <Text>{slot.part ?? "No part; measured values only"}</Text>
              {slot.values.map((v) => (
                <Text key={v.label} style={s.note}>
                  {v.label}: {v.value}
                  {v.measured ? " (measured)" : " (catalog)"}
                </Text>
              ))}
            </View>
          </View>
        ))}
        {model.findings.length || model.cautions.length ? (
          <>
            <Text style={s.h2}>Findings and cautions</Text>
            {[...model.findings.map((f) => `${f.kind}: ${f.message}`), ...model.cautions].map(
              (m, i) => (
                <Text key={i}>• {m}</Text>
              ),
            )}
          </>
        ) : null}
        <View style={s.box} wrap={false}>
          <Text style={s.strong}>Safety</Text>
          {model.safety.map((line, i) => (
            <Text key={i}>• {line}</Text>
          ))}
        </View>
      </Page>
    </Document>,
  );
}

function QuotePart({ quote }: { quote: QuoteForPdf }) {
  const t = quote.totals;
  return (
    <>
      <Text style={s.sub}>
        For {quote.customerName} from {quote.shopName}
      </Text>
      <Text style={s.h2}>The price</Text>
      {quote.lines.map((l, i) => (
        <View style={s.row} key={i} wrap={false}>
          <Text style={s.cellWide}>{l.description}</Text>
          <Text style={s.cell}>{formatHundredths(l.quantityHundredths)}</Text>
          <Text style={s.cell}>{formatCents(l.unitCents)}</Text>
          <Text style={s.cell}>{formatCents(l.amountCents ?? 0)}</Text>
        </View>
      ))}
      {[
        ["Subtotal", formatCents(t.subtotalCents)],
        ...(t.discountCents > 0 ? [["Discount", `− ${formatCents(t.discountCents)}`]] : []),
        [`Tax ${formatPercent(quote.terms.taxRateBasisPoints)}`, formatCents(t.taxCents)],
        ["Total", formatCents(t.totalCents)],
        ["Deposit", formatCents(t.depositCents)],
      ].map(([label, value]) => (
        <View style={s.row} key={label}>
          <Text style={[s.cellWide, { textAlign: "right" }]}>{label}</Text>
          <Text style={[s.cell, s.strong]}>{value}</Text>
        </View>
      ))}
    </>
  );
}
