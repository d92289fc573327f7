import { TableScroll } from "@/components/ui/table-scroll";
import { instrumentRows } from "@/lib/engine/certificates/instruments";
import type { CertificateDocument } from "@/lib/engine/certificates/document";

/** The instruments a certificate's readings were taken with and their calibration due dates. */
export function InstrumentsUsed({ document }: { document: Pick<CertificateDocument, "instruments" | "readings"> }) {
  const rows = instrumentRows(document);
  if (rows.length === 0) return null;
  return (
    <TableScroll label="Instruments used">
      <table className="dense-table w-full">
        <caption className="mb-1 text-left font-semibold">Instruments used</caption>
        <thead>
          <tr>
            <th scope="col">Ref.</th>
            <th scope="col">Instrument</th>
            <th scope="col">Serial</th>
            <th scope="col">Calibration due</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((i) => (
            <tr key={i.ref}>
              <td className="figure">{i.ref}</td>
              <th scope="row" className="text-left font-normal">
                {i.name}
                <span className="block text-xs text-bakelite-muted">{i.kind}</span>
              </th>
              <td className="figure">{i.serial}</td>
              <td className={`figure whitespace-nowrap ${i.overdueReadings > 0 ? "font-semibold text-fail" : ""}`}>
                {i.overdueReadings > 0 ? <span aria-hidden="true">⚠ </span> : null}
                {i.calibrationDueOn}
                {i.overdueReadings > 0 ? ` (overdue for ${i.overdueReadings} reading${i.overdueReadings === 1 ? "" : "s"})` : ""}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}
