import { TableScroll } from "@/components/ui/table-scroll";
import { bandEdgeRows } from "@/lib/engine/certificates/tables";
import type { CertificateDocument } from "@/lib/engine/certificates/document";

const VERDICT_ICON = { true: "✓", false: "✕", null: "–" } as const;

/** Per band: the printed dial range, the measured edges, the tolerance applied and the verdict in words. */
export function BandEdgeTable({
  document,
  caption = "Band edges, measured against the dial",
}: {
  document: Pick<CertificateDocument, "bands" | "readings">;
  caption?: string;
}) {
  const rows = bandEdgeRows(document);
  // Certificates with readings taken as the set came in show them beside the ones it went back with.
  const received = rows.some((r) => r.lowAsReceived !== null || r.highAsReceived !== null);
  return (
    <TableScroll label={caption ?? "Band edges"}>
      <table className="dense-table w-full">
        <caption className="mb-1 text-left font-semibold">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Band</th>
            <th scope="col">Dial range</th>
            {received ? <th scope="col">As received (low – high)</th> : null}
            <th scope="col">{received ? "Low edge, as returned" : "Low edge measured"}</th>
            <th scope="col">{received ? "High edge, as returned" : "High edge measured"}</th>
            <th scope="col">Tolerance applied</th>
            <th scope="col">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.index}>
              <th scope="row" className="text-left font-normal">
                {r.name}
              </th>
              <td className="figure whitespace-nowrap">{r.nominal}</td>
              {received ? (
                <td className="figure whitespace-nowrap">
                  {r.lowAsReceived || r.highAsReceived ? `${r.lowAsReceived ?? "—"} – ${r.highAsReceived ?? "—"}` : "—"}
                </td>
              ) : null}
              <td className="figure whitespace-nowrap">{r.low}</td>
              <td className="figure whitespace-nowrap">{r.high}</td>
              <td>{r.tolerance}</td>
              <td
                className={`whitespace-nowrap font-semibold ${r.passed === false ? "text-fail" : r.passed ? "text-pass" : "text-bakelite-muted"}`}
              >
                <span aria-hidden="true">{VERDICT_ICON[String(r.passed) as "true" | "false" | "null"]} </span>
                {r.verdict}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}
