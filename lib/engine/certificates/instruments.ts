import { INSTRUMENT_KIND_LABEL } from "../instruments";
import type { CertificateDocument } from "./document";

// The certificate's instrument and as-received blocks, as calibration laboratories print them: each
// instrument used with its calibration due date, and a reading's figure as received beside the one as returned.

export type InstrumentRow = {
  ref: string;
  kind: string;
  name: string;
  serial: string;
  calibratedOn: string;
  calibrationDueOn: string;
  /** Readings taken with it while its calibration was overdue. */
  overdueReadings: number;
};

/** One row per instrument named by a reading, in the order of their references. */
export function instrumentRows(d: Pick<CertificateDocument, "instruments" | "readings">): InstrumentRow[] {
  return (d.instruments ?? []).map((i) => {
    const overdueReadings = d.readings.reduce(
      (n, r) =>
        n +
        (r.instrument === i.ref && r.instrumentOverdue ? 1 : 0) +
        (r.asReceived?.instrument === i.ref && r.asReceived.instrumentOverdue ? 1 : 0),
      0,
    );
    return {
      ref: i.ref,
      kind: INSTRUMENT_KIND_LABEL[i.kind],
      name: `${i.maker} ${i.model}`,
      serial: i.serial,
      calibratedOn: i.calibratedOn,
      calibrationDueOn: i.calibrationDueOn,
      overdueReadings,
    };
  });
}

/** True when any reading was also taken as the set came in: the tables then show both columns. */
export function hasAsReceived(d: Pick<CertificateDocument, "readings">): boolean {
  return d.readings.some((r) => r.asReceived !== undefined);
}

/** "I2", or "I2 (calibration overdue)"; "—" when no instrument was named. */
export function takenWithText(r: { instrument?: string; instrumentOverdue?: true } | undefined): string {
  if (!r?.instrument) return "—";
  return r.instrumentOverdue ? `${r.instrument} (calibration overdue)` : r.instrument;
}
