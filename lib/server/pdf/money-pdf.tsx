import "server-only";
import { Document, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { registerFonts } from "@/lib/server/pdf/certificate-pdf";

// Receipts, refund notes, invoices and the printable estimate. The server hands over every word and figure
// already formatted (dates in the shop's zone, money in the job's currency); this only lays them out.

export type DocumentLine = { description: string; detail?: string; amount: string };
export type DocumentFigure = { label: string; value: string; strong?: boolean };

/** Everything a money PDF prints. */
export type MoneyPdfContent = {
  title: string;
  /** Null for the estimate, which is a proposal, not an issued document. */
  number: string | null;
  issuedOn: string;
  shop: { name: string; addressLines: string[]; phone: string; email: string; taxNumber: string };
  billTo: { name: string; email: string | null };
  /** Where the set goes back to; null when none is known. */
  shipTo: string[] | null;
  facts: DocumentFigure[];
  lines: DocumentLine[];
  figures: DocumentFigure[];
  notes: string[];
};

/** A task for the PDF worker threads that is not a certificate. */
export type MoneyPdfTask = { kind: "money"; content: MoneyPdfContent };

const ink = "#2a2320";
const muted = "#5f544b";
const rule = "#cbbda5";
const accent = "#8a3517";

const s = StyleSheet.create({
  page: { fontFamily: "Plex Sans", fontSize: 9, color: ink, paddingTop: 34, paddingBottom: 40, paddingHorizontal: 40, lineHeight: 1.35 },
  header: { flexDirection: "row", justifyContent: "space-between", borderBottomWidth: 1.5, borderBottomColor: accent, paddingBottom: 10 },
  shopName: { fontSize: 13, fontWeight: 700 },
  small: { fontSize: 8, color: muted },
  title: { fontSize: 18, fontWeight: 700, color: accent, textAlign: "right" },
  number: { fontFamily: "Plex Mono", fontSize: 10, fontWeight: 500, textAlign: "right", marginTop: 2 },
  parties: { flexDirection: "row", gap: 16, marginTop: 12 },
  party: { flex: 1 },
  label: { fontSize: 7, color: muted, textTransform: "uppercase", letterSpacing: 0.5, marginBottom: 2 },
  facts: { flexDirection: "row", flexWrap: "wrap", marginTop: 12 },
  fact: { width: "33%", marginBottom: 5 },
  factValue: { fontSize: 9.5, fontWeight: 600 },
  table: { marginTop: 12, borderTopWidth: 0.75, borderTopColor: ink },
  tr: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: rule, paddingVertical: 3 },
  th: { fontSize: 7.5, fontWeight: 700, color: muted, textTransform: "uppercase" },
  desc: { width: "72%", paddingRight: 6 },
  amount: { width: "28%", textAlign: "right", fontFamily: "Plex Mono" },
  figures: { marginTop: 10, marginLeft: "40%" },
  figure: { flexDirection: "row", justifyContent: "space-between", paddingVertical: 1.5 },
  strong: { fontWeight: 700, borderTopWidth: 0.75, borderTopColor: ink, paddingTop: 3 },
  notes: { marginTop: 16 },
  footer: { position: "absolute", bottom: 18, left: 40, right: 40, fontSize: 7, color: muted },
});

function MoneyPdf({ c }: { c: MoneyPdfContent }) {
  return (
    <Document title={c.number ? `${c.title} ${c.number}` : c.title} author={c.shop.name}>
      <Page size="A4" style={s.page}>
        <View style={s.header}>
          <View>
            <Text style={s.shopName}>{c.shop.name}</Text>
            {c.shop.addressLines.map((l, i) => (
              <Text key={i} style={s.small}>
                {l}
              </Text>
            ))}
            {c.shop.phone || c.shop.email ? <Text style={s.small}>{[c.shop.phone, c.shop.email].filter(Boolean).join(" · ")}</Text> : null}
            {c.shop.taxNumber ? <Text style={s.small}>Tax number: {c.shop.taxNumber}</Text> : null}
          </View>
          <View>
            <Text style={s.title}>{c.title}</Text>
            {c.number ? <Text style={s.number}>No. {c.number}</Text> : null}
            <Text style={[s.small, { textAlign: "right" }]}>
              {c.number ? "Issued" : "Sent"} {c.issuedOn}
            </Text>
          </View>
        </View>
        <View style={s.parties}>
          <View style={s.party}>
            <Text style={s.label}>{c.number ? "Bill to" : "Prepared for"}</Text>
            <Text>{c.billTo.name}</Text>
            {c.billTo.email ? <Text style={s.small}>{c.billTo.email}</Text> : null}
          </View>
          <View style={s.party}>
            <Text style={s.label}>Ship to</Text>
            {c.shipTo && c.shipTo.length > 0 ? (
              c.shipTo.map((l, i) => <Text key={i}>{l}</Text>)
            ) : (
              <Text style={s.small}>Collected from the shop unless arranged otherwise</Text>
            )}
          </View>
        </View>
        <View style={s.facts}>
          {c.facts.map((f, i) => (
            <View key={i} style={s.fact}>
              <Text style={s.label}>{f.label}</Text>
              <Text style={s.factValue}>{f.value}</Text>
            </View>
          ))}
        </View>
        <View style={s.table}>
          <View style={s.tr}>
            <Text style={[s.th, s.desc]}>Item</Text>
            <Text style={[s.th, s.amount]}>Amount</Text>
          </View>
          {c.lines.map((l, i) => (
            <View key={i} style={s.tr} wrap={false}>
              <View style={s.desc}>
                <Text>{l.description}</Text>
                {l.detail ? <Text style={s.small}>{l.detail}</Text> : null}
              </View>
              <Text style={s.amount}>{l.amount}</Text>
            </View>
          ))}
        </View>
        <View style={s.figures} wrap={false}>
          {c.figures.map((f, i) => (
            <View key={i} style={[s.figure, f.strong ? s.strong : {}]}>
              <Text>{f.label}</Text>
              <Text style={{ fontFamily: "Plex Mono" }}>{f.value}</Text>
            </View>
          ))}
        </View>
        {c.notes.length ? (
          <View style={s.notes}>
            {c.notes.map((n, i) => (
              <Text key={i} style={s.small}>
                {n}
              </Text>
            ))}
          </View>
        ) : null}
        <Text
          style={s.footer}
          fixed
          render={({ pageNumber, totalPages }) =>
            `${c.shop.name}${c.number ? ` · ${c.title} ${c.number}` : ""} · page ${pageNumber} of ${totalPages}`
          }
        />
      </Page>
    </Document>
  );
}

export async function renderMoneyPdf(content: MoneyPdfContent): Promise<Buffer> {
  registerFonts();
  return renderToBuffer(<MoneyPdf c={content} />);
}
