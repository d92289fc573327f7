import "server-only";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { Document, Font, Image, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import QRCode from "qrcode";
import { setKindLabels } from "@/lib/engine/checklist/profile";
import { formatDay } from "@/lib/engine/dates";
import { describeTerm } from "@/lib/engine/warranty/term";
import type { CertificateDocument, CertificateReading } from "@/lib/engine/certificates/document";
import { woffToSfnt } from "@/lib/server/pdf/woff";
import { bandEdgeRows, formatReading, otherReadings, VERDICT_WORD, type BandEdgeRow } from "@/lib/engine/certificates/tables";
import { passbandRows, type PassbandSection, type PerformanceSection } from "@/lib/engine/certificates/performance-section";
import { hasAsReceived, instrumentRows, takenWithText } from "@/lib/engine/certificates/instruments";

// Fonts ship with the app from node_modules/@fontsource. The renderer takes TTF or WOFF (not WOFF2);
// the WOFF files are unpacked to plain TrueType in memory, which its parser reads reliably.
let fontsRegistered = false;
function fontData(pkg: string, file: string): string {
  const woff = readFileSync(join(process.cwd(), "node_modules", "@fontsource", pkg, "files", file));
  return `data:font/ttf;base64,${woffToSfnt(woff).toString("base64")}`;
}

export function registerFonts() {
  if (fontsRegistered) return;
  Font.register({
    family: "Plex Sans",
    fonts: [
      { src: fontData("ibm-plex-sans", "ibm-plex-sans-latin-400-normal.woff"), fontWeight: 400 },
      { src: fontData("ibm-plex-sans", "ibm-plex-sans-latin-600-normal.woff"), fontWeight: 600 },
      { src: fontData("ibm-plex-sans", "ibm-plex-sans-latin-700-normal.woff"), fontWeight: 700 },
    ],
  });
  Font.register({
    family: "Plex Mono",
    fonts: [
      { src: fontData("ibm-plex-mono", "ibm-plex-mono-latin-400-normal.woff"), fontWeight: 400 },
      { src: fontData("ibm-plex-mono", "ibm-plex-mono-latin-500-normal.woff"), fontWeight: 500 },
    ],
  });
  // Codes and frequencies must never be split across lines.
  Font.registerHyphenationCallback((word) => [word]);
  fontsRegistered = true;
}

const ink = "#2a2320";
const muted = "#5f544b";
const rule = "#cbbda5";
const accent = "#8a3517";

const s = StyleSheet.create({
  page: { fontFamily: "Plex Sans", fontSize: 7.4, color: ink, paddingTop: 28, paddingBottom: 34, paddingHorizontal: 34, lineHeight: 1.3 },
  header: {
    flexDirection: "row",
    justifyContent: "space-between",
    borderBottomWidth: 1.5,
    borderBottomColor: accent,
    paddingBottom: 8,
    marginBottom: 8,
  },
  shop: { fontSize: 8, color: muted },
  shopName: { fontSize: 12, fontWeight: 700, color: ink, lineHeight: 1.2 },
  designation: { fontSize: 16, fontWeight: 700, color: accent, marginTop: 6, lineHeight: 1.2 },
  title: { fontSize: 10, fontWeight: 600, lineHeight: 1.3 },
  code: { fontFamily: "Plex Mono", fontSize: 8.5, fontWeight: 500, marginTop: 3 },
  qr: { width: 78, height: 78 },
  qrBox: { alignItems: "center", width: 130 },
  qrNote: { fontSize: 6.5, color: muted, textAlign: "center" },
  h2: { fontSize: 9, fontWeight: 700, marginTop: 8, marginBottom: 3, color: ink, textTransform: "uppercase", letterSpacing: 0.6 },
  facts: { flexDirection: "row", flexWrap: "wrap" },
  fact: { width: "25%", marginBottom: 3 },
  factLabel: { fontSize: 6.5, color: muted, textTransform: "uppercase" },
  factValue: { fontSize: 8.5, fontWeight: 600 },
  table: { borderTopWidth: 0.75, borderTopColor: ink },
  tr: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: rule, paddingVertical: 2 },
  th: { fontSize: 6.8, fontWeight: 700, color: muted, textTransform: "uppercase" },
  td: { fontSize: 7.4, paddingRight: 4 },
  num: { fontFamily: "Plex Mono", fontSize: 7.4, paddingRight: 4 },
  columns: { flexDirection: "row", gap: 14 },
  col: { flex: 1 },
  p: { marginBottom: 2.5 },
  li: { flexDirection: "row", marginBottom: 1.5 },
  bullet: { width: 9 },
  small: { fontSize: 6.8, color: muted },
  footer: {
    position: "absolute",
    bottom: 14,
    left: 34,
    right: 34,
    fontSize: 6.5,
    color: muted,
  },
  terms: { fontSize: 8.4, lineHeight: 1.4 },
  tp: { marginBottom: 3.5 },
  th3: { fontWeight: 700, marginBottom: 1.5, marginTop: 1 },
  notice: { borderWidth: 1, borderColor: accent, padding: 4, marginBottom: 6, fontWeight: 600, color: accent },
});

function Cell({ w, children, mono, bold }: { w: string; children: React.ReactNode; mono?: boolean; bold?: boolean }) {
  return <Text style={[mono ? s.num : s.td, { width: w }, bold ? { fontWeight: 700 } : {}]}>{children}</Text>;
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <View style={s.fact}>
      <Text style={s.factLabel}>{label}</Text>
      <Text style={s.factValue}>{value}</Text>
    </View>
  );
}

function ReadingsTable({ rows, received, instruments }: { rows: CertificateReading[]; received: boolean; instruments: boolean }) {
  // As received and the instrument columns appear only on certificates that have them.
  const tolerance = `${36 - (received ? 12 : 0) - (instruments ? 9 : 0)}%`;
  return (
    <View style={s.table}>
      <View style={s.tr}>
        <Text style={[s.th, { width: "30%" }]}>Reading</Text>
        <Text style={[s.th, { width: "12%" }]}>Nominal</Text>
        {received ? <Text style={[s.th, { width: "12%" }]}>As received</Text> : null}
        <Text style={[s.th, { width: "12%" }]}>{received ? "As returned" : "Measured"}</Text>
        <Text style={[s.th, { width: tolerance }]}>Tolerance applied</Text>
        {instruments ? <Text style={[s.th, { width: "9%" }]}>Instrument</Text> : null}
        <Text style={[s.th, { width: "10%" }]}>Verdict</Text>
      </View>
      {rows.map((r) => (
        <View key={r.key} style={s.tr} wrap={false}>
          <Cell w="30%">{r.label}</Cell>
          <Cell w="12%" mono>
            {r.nominal === null ? "—" : formatReading(r.nominal, r.unit)}
          </Cell>
          {received ? (
            <Cell w="12%" mono>
              {r.asReceived ? `${formatReading(r.asReceived.value, r.unit)} (${VERDICT_WORD[r.asReceived.verdict]})` : "—"}
            </Cell>
          ) : null}
          <Cell w="12%" mono>
            {formatReading(r.value, r.unit)}
          </Cell>
          <Cell w={tolerance}>{r.toleranceText}</Cell>
          {instruments ? (
            <Cell w="9%">
              {[...new Set([r.asReceived ? takenWithText(r.asReceived) : null, takenWithText(r)].filter((t) => t !== null))].join(" / ")}
            </Cell>
          ) : null}
          <Cell w="10%" bold>
            {VERDICT_WORD[r.verdict]}
          </Cell>
        </View>
      ))}
    </View>
  );
}

function PerformanceBlock({ section }: { section: PerformanceSection }) {
  return (
    <View>
      <Text style={s.h2}>Receiver performance</Text>
      <Text style={s.p}>
        {section.conditions}. Each reading is judged against the set&apos;s own service figure (or the tube tester&apos;s minimum) where one
        was entered; without one it is marked Recorded.
      </Text>
      <View style={s.table}>
        <View style={s.tr}>
          <Text style={[s.th, { width: "40%" }]}>Reading</Text>
          <Text style={[s.th, { width: "14%" }]}>Measured</Text>
          <Text style={[s.th, { width: "34%" }]}>Judged against</Text>
          <Text style={[s.th, { width: "12%" }]}>Verdict</Text>
        </View>
        {section.readings.map((r) => (
          <View key={r.key} style={s.tr} wrap={false}>
            <Cell w="40%">{r.label}</Cell>
            <Cell w="14%" mono>
              {formatReading(r.value, r.unit)}
            </Cell>
            <Cell w="34%">{r.toleranceText}</Cell>
            <Cell w="12%" bold>
              {VERDICT_WORD[r.verdict]}
            </Cell>
          </View>
        ))}
      </View>
    </View>
  );
}

function PassbandBlock({ section }: { section: PassbandSection }) {
  return (
    <View>
      <Text style={s.h2}>IF passband</Text>
      <Text style={s.p}>
        Relative response at offsets around the IF; edges found by interpolation between the readings, symmetry as the upper half-width less
        the lower one, measured from the peak.
      </Text>
      <View style={s.table}>
        <View style={s.tr}>
          <Text style={[s.th, { width: "14%" }]}>IF</Text>
          <Text style={[s.th, { width: "30%" }]}>Curve</Text>
          <Text style={[s.th, { width: "56%" }]}>Figures</Text>
        </View>
        {passbandRows(section).map((r, i) => (
          <View key={i} style={s.tr} wrap={false}>
            <Cell w="14%" mono>
              {r.ifText}
            </Cell>
            <Cell w="30%">{r.what}</Cell>
            <Cell w="56%">{r.figures.join("; ")}</Cell>
          </View>
        ))}
      </View>
    </View>
  );
}

/** The instruments a band's edge readings were taken with, as returned (and as received where different). */
function edgeInstruments(b: BandEdgeRow): string {
  const texts = [b.lowReading?.asReceived, b.highReading?.asReceived, b.lowReading ?? undefined, b.highReading ?? undefined]
    .filter((r) => r?.instrument)
    .map((r) => takenWithText(r));
  return [...new Set(texts)].join(", ") || "—";
}

/** The instruments the readings were taken with and their calibration due dates (its own block). */
function InstrumentsUsed({ d }: { d: CertificateDocument }) {
  const rows = instrumentRows(d);
  if (rows.length === 0) return null;
  return (
    <View wrap={false}>
      <Text style={s.h2}>Instruments used</Text>
      <View style={s.table}>
        <View style={s.tr}>
          <Text style={[s.th, { width: "8%" }]}>Ref.</Text>
          <Text style={[s.th, { width: "22%" }]}>Kind</Text>
          <Text style={[s.th, { width: "30%" }]}>Maker and model</Text>
          <Text style={[s.th, { width: "14%" }]}>Serial</Text>
          <Text style={[s.th, { width: "13%" }]}>Calibrated</Text>
          <Text style={[s.th, { width: "13%" }]}>Calibration due</Text>
        </View>
        {rows.map((i) => (
          <View key={i.ref} style={s.tr} wrap={false}>
            <Cell w="8%" mono>
              {i.ref}
            </Cell>
            <Cell w="22%">{i.kind}</Cell>
            <Cell w="30%">{i.name}</Cell>
            <Cell w="14%" mono>
              {i.serial}
            </Cell>
            <Cell w="13%" mono>
              {i.calibratedOn}
            </Cell>
            <Cell w="13%" mono bold={i.overdueReadings > 0}>
              {i.calibrationDueOn}
              {i.overdueReadings > 0 ? ` — overdue for ${i.overdueReadings} reading${i.overdueReadings === 1 ? "" : "s"}` : ""}
            </Cell>
          </View>
        ))}
      </View>
      <Text style={s.small}>
        A reading marked &quot;calibration overdue&quot; was taken with an instrument past its calibration due date on that day.
      </Text>
    </View>
  );
}

export type CertificatePdfInput = {
  document: CertificateDocument;
  verifyUrl: string;
  keyId: string;
  issuedAt: Date;
  status: { revoked?: { reason: string; on: string } | null; supersededByCode?: string | null };
};

/** Characters of the written terms; well under a page's worth at the terms' type size keeps them on one page. */
function termsFitOnePage(d: CertificateDocument): boolean {
  const t = d.terms;
  const chars = [
    t.whoIsCovered,
    t.whatWeWillDo,
    t.whatWeWillNotDo,
    t.disputes,
    t.impliedWarranties,
    t.consequentialDamages,
    t.shopWording,
    t.rightsSentence,
  ]
    .concat(
      t.howToClaim,
      d.warranty.covered.map((c) => c.text),
      d.warranty.excluded.map((e) => e.text),
    )
    .join(" ").length;
  return chars <= 6000;
}

function CertificatePdf({ document: d, verifyUrl, keyId, qr, status }: CertificatePdfInput & { qr: string }) {
  const designation = d.warranty.designation === "full" ? "Full" : "Limited";
  const edges = bandEdgeRows(d);
  const others = otherReadings(d);
  const received = hasAsReceived(d);
  const withInstruments = (d.instruments ?? []).length > 0;
  const setName = `${d.set.maker} ${d.set.model}${d.set.year ? ` (${d.set.year})` : ""}`;
  const verifyHost = verifyUrl.replace(/^https?:\/\//, "").replace(/\/verify\/.*$/, "/verify");
  return (
    <Document
      title={`Warranty certificate ${d.code}`}
      author={d.shop.name}
      subject={`${designation} warranty for ${setName}`}
      creator="Bandedge"
      producer="Bandedge"
    >
      <Page size="LETTER" style={s.page}>
        {status.revoked ? (
          <Text style={s.notice}>
            REVOKED on {status.revoked.on}: {status.revoked.reason}
          </Text>
        ) : null}
        {status.supersededByCode ? <Text style={s.notice}>SUPERSEDED: replaced by certificate {status.supersededByCode}.</Text> : null}
        <View style={s.header}>
          <View style={{ flex: 1 }}>
            <Text style={s.shopName}>{d.shop.name}</Text>
            <Text style={s.shop}>
              {d.shop.address}
              {d.shop.phone ? ` · ${d.shop.phone}` : ""}
            </Text>
            <Text style={s.designation}>
              {designation} warranty · {d.warranty.termDays} days
            </Text>
            <Text style={s.title}>Certificate of restoration and alignment</Text>
            <Text style={s.code}>Code {d.code}</Text>
            {d.answers ? (
              <Text style={s.small}>
                Warranty work under certificate {d.answers.certificateCode}, claim of {formatDay(d.answers.claimOpenedOn)} (ref.{" "}
                {d.answers.claimId.slice(0, 8)}). Covers the work and parts listed here.
              </Text>
            ) : null}
            {d.correction ? (
              <Text style={s.small}>
                Corrects certificate {d.correction.supersedesCode}: {d.correction.reason}
              </Text>
            ) : null}
          </View>
          <View style={s.qrBox}>
            {/* react-pdf's Image has no alt text; the URL is printed beneath it. */}
            {/* eslint-disable-next-line jsx-a11y/alt-text -- a PDF image, not an HTML one: react-pdf has no alt prop */}
            <Image src={qr} style={s.qr} />
            <Text style={s.qrNote}>Scan to check this certificate, or enter its code at</Text>
            <Text style={[s.qrNote, { fontFamily: "Plex Mono" }]}>{verifyHost}</Text>
          </View>
        </View>

        <View style={s.facts}>
          <Fact label="Set" value={setName} />
          <Fact label="Kind" value={setKindLabels[d.set.kind]} />
          <Fact label="Serial" value={d.set.serial ?? "not recorded"} />
          <Fact label="Issued to" value={d.owner.name || "—"} />
          <Fact label="Technician" value={d.technician.name} />
          <Fact label="Returned" value={formatDay(d.completedOn)} />
          <Fact label="Term starts" value={formatDay(d.warranty.startsOn)} />
          <Fact label="Term ends" value={formatDay(d.warranty.endsOn)} />
          <Fact label="Issued" value={formatDay(d.issuedOn)} />
        </View>

        <Text style={s.h2}>Band edges, measured against the dial</Text>
        <View style={s.table}>
          <View style={s.tr}>
            <Text style={[s.th, { width: "16%" }]}>Band</Text>
            <Text style={[s.th, { width: "20%" }]}>Dial range</Text>
            {received ? <Text style={[s.th, { width: "15%" }]}>As received (low – high)</Text> : null}
            <Text style={[s.th, { width: "12%" }]}>{received ? "Low, as returned" : "Low edge"}</Text>
            <Text style={[s.th, { width: "12%" }]}>{received ? "High, as returned" : "High edge"}</Text>
            <Text style={[s.th, { width: received ? "15%" : "30%" }]}>Tolerance applied</Text>
            <Text style={[s.th, { width: "10%" }]}>Verdict</Text>
          </View>
          {edges.map((b) => (
            <View key={b.index} style={s.tr} wrap={false}>
              <Cell w="16%">{b.name}</Cell>
              <Cell w="20%" mono>
                {b.nominal}
              </Cell>
              {received ? (
                <Cell w="15%" mono>
                  {b.lowAsReceived || b.highAsReceived ? `${b.lowAsReceived ?? "—"} – ${b.highAsReceived ?? "—"}` : "—"}
                </Cell>
              ) : null}
              <Cell w="12%" mono>
                {b.low}
              </Cell>
              <Cell w="12%" mono>
                {b.high}
              </Cell>
              <Cell w={received ? "15%" : "30%"}>
                {b.tolerance}
                {withInstruments ? ` · with ${edgeInstruments(b)}` : ""}
              </Cell>
              <Cell w="10%" bold>
                {b.verdict}
              </Cell>
            </View>
          ))}
        </View>

        <Text style={s.h2}>IF, dial calibration, leakage and supply readings</Text>
        <Text style={s.p}>
          Dial calibration is where the set receives against where the dial points. Each band has one tolerance for it, in received
          frequency; a reading taken on the oscillator (LO) is judged by the same window around mark + IF. The tolerance column says which
          reading each verdict came from. A reading with no figure to judge it by is marked Recorded.
        </Text>
        {received ? (
          <Text style={s.p}>
            As received: measured when the set came in, before any work. As returned: measured at the final checks; the verdicts and band
            edges are judged on these.
          </Text>
        ) : null}
        <ReadingsTable rows={others} received={received} instruments={withInstruments} />
        <InstrumentsUsed d={d} />

        {d.performance ? <PerformanceBlock section={d.performance} /> : null}
        {d.passband ? <PassbandBlock section={d.passband} /> : null}

        <View style={s.columns}>
          <View style={s.col}>
            <Text style={s.h2}>Work done</Text>
            <Text style={s.p}>{d.work.map((w) => w.title).join("; ") || "—"}.</Text>
          </View>
          <View style={s.col}>
            <Text style={s.h2}>Parts replaced</Text>
            <Text style={s.p}>{d.parts.length ? d.parts.map((p) => `${p.title} × ${p.quantity}`).join("; ") : "None"}.</Text>
          </View>
        </View>

        {/* The terms read top to bottom in one column, in the order the wording refers to itself: what the
            shop will not do comes before the list of exclusions it points to, and the warrantor's address before
            the disputes paragraph that sends the reader to it. The terms stay together on one page when they
            fit one (the usual case), so a page never ends on a short tail of them; longer shop wording flows
            from page to page, each part kept whole. */}
        <View style={s.terms} wrap={!termsFitOnePage(d)}>
          <Text style={s.h2} minPresenceAhead={60}>
            {designation} warranty — the terms
          </Text>
          <Text style={s.tp} wrap={false}>
            <Text style={{ fontWeight: 700 }}>Term. </Text>
            {describeTerm(d.warranty, d.completedOn)}
          </Text>
          <Text style={s.tp} wrap={false}>
            <Text style={{ fontWeight: 700 }}>Who is covered. </Text>
            {d.terms.whoIsCovered}{" "}
            {d.terms.transferable
              ? "Coverage passes to a later owner for the rest of the term."
              : "Coverage does not pass to a later owner."}
          </Text>
          <View wrap={false}>
            <Text style={s.th3}>What is covered</Text>
            {d.warranty.covered.map((c) => (
              <View key={c.key} style={s.li}>
                <Text style={s.bullet}>•</Text>
                <Text style={{ flex: 1 }}>{c.text}</Text>
              </View>
            ))}
          </View>
          <Text style={s.tp} wrap={false}>
            <Text style={{ fontWeight: 700 }}>What we will do. </Text>
            {d.terms.whatWeWillDo}
          </Text>
          <View wrap={false}>
            <Text style={s.tp}>
              <Text style={{ fontWeight: 700 }}>What we will not do. </Text>
              {d.terms.whatWeWillNotDo}
            </Text>
            <Text style={s.th3}>What is not covered</Text>
            {d.warranty.excluded.map((e) => (
              <View key={e.code} style={s.li}>
                <Text style={s.bullet}>•</Text>
                <Text style={{ flex: 1 }}>{e.text}</Text>
              </View>
            ))}
          </View>
          <View wrap={false}>
            <Text style={s.th3}>How to make a claim</Text>
            {d.terms.howToClaim.map((step, i) => (
              <View key={i} style={s.li}>
                <Text style={s.bullet}>{i + 1}.</Text>
                <Text style={{ flex: 1 }}>{step}</Text>
              </View>
            ))}
          </View>
          <View wrap={false}>
            <Text style={s.tp}>
              <Text style={{ fontWeight: 700 }}>Warrantor. </Text>
              {d.shop.name}, {d.shop.address}
              {d.shop.phone ? `, ${d.shop.phone}` : ""}.
            </Text>
            <Text style={s.tp}>
              <Text style={{ fontWeight: 700 }}>Disputes. </Text>
              {d.terms.disputes}
            </Text>
          </View>
          <Text style={s.tp} wrap={false}>
            {d.terms.impliedWarranties}
          </Text>
          <Text style={s.tp} wrap={false}>
            {d.terms.consequentialDamages}
          </Text>
          {d.terms.shopWording ? <Text style={s.tp}>{d.terms.shopWording}</Text> : null}
          <Text style={[s.tp, { fontWeight: 600 }]} wrap={false}>
            {d.terms.rightsSentence}
          </Text>
        </View>

        {/* A fixed text placed on the page itself: the earlier fixed, absolutely placed row printed nothing, and
            the renderer's page-number callback prints nothing here either, so the line is static. */}
        <Text style={s.footer} fixed>
          Signed (Ed25519, key {keyId}). Any change to this certificate makes the check at {verifyHost} fail.
        </Text>
      </Page>
    </Document>
  );
}

/** The certificate as a PDF, with the QR code to its verification page. */
export async function renderCertificatePdf(input: CertificatePdfInput): Promise<Buffer> {
  registerFonts();
  const qr = await QRCode.toDataURL(input.verifyUrl, {
    errorCorrectionLevel: "M",
    margin: 1,
    width: 320,
    color: { dark: "#2a2320", light: "#ffffff" },
  });
  return renderToBuffer(<CertificatePdf {...input} qr={qr} />);
}
