import type { Metadata } from "next";
import { InstrumentRegister } from "@/components/office/instrument-register";
import { requirePermission } from "@/lib/server/session";
import { listInstruments } from "@/lib/server/services/instruments";

export const metadata: Metadata = { title: "Instruments" };

export default async function InstrumentsPage() {
  await requirePermission("instrument.manage", "/office/instruments");
  const instruments = await listInstruments();
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-3xl font-bold">Instruments</h1>
        <p className="max-w-prose text-bakelite-soft">
          The shop&apos;s test instruments and their calibration. The bench offers each reading the instruments of its kind; a reading taken
          after an instrument&apos;s calibration due date is flagged on the bench sheet and on the certificate, which lists every instrument
          used with its due date. A retired instrument stays here for the history of its readings and is no longer offered.
        </p>
      </div>
      <InstrumentRegister initial={instruments} />
    </div>
  );
}
