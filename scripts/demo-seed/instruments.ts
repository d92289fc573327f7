import { sql } from "drizzle-orm";
import { instruments } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import type { InstrumentKind } from "@/lib/engine/instruments";

// The demo shop's bench instruments, from invented makers. Dates are relative to the day of the seed, so
// the demo always has instruments in calibration, one overdue and one retired.
const DEMO_INSTRUMENTS: {
  kind: InstrumentKind;
  maker: string;
  model: string;
  serial: string;
  calibratedDaysAgo: number;
  dueInDays: number;
  retired?: boolean;
}[] = [
  {
    kind: "signal_generator",
    maker: "Port Alder Instruments",
    model: "SG-40",
    serial: "PAI-40-0117",
    calibratedDaysAgo: 120,
    dueInDays: 245,
  },
  {
    kind: "frequency_counter",
    maker: "Port Alder Instruments",
    model: "FC-7",
    serial: "PAI-FC7-2291",
    calibratedDaysAgo: 390,
    dueInDays: -25,
  },
  { kind: "meter", maker: "Kestrel Bench Meters", model: "KM-3", serial: "KBM3-0845", calibratedDaysAgo: 60, dueInDays: 305 },
  { kind: "leakage_tester", maker: "Tillwater Electric", model: "LT-2", serial: "TW-LT2-0310", calibratedDaysAgo: 90, dueInDays: 275 },
  { kind: "oscilloscope", maker: "Tillwater Electric", model: "Scope 15", serial: "TW-S15-1102", calibratedDaysAgo: 200, dueInDays: 165 },
  { kind: "tube_tester", maker: "Kestrel Bench Meters", model: "Emission 9", serial: "KBM-E9-0077", calibratedDaysAgo: 300, dueInDays: 65 },
  {
    kind: "signal_generator",
    maker: "Port Alder Instruments",
    model: "SG-12",
    serial: "PAI-12-0042",
    calibratedDaysAgo: 900,
    dueInDays: -535,
    retired: true,
  },
];

const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);

/** Adds the demo instruments not yet in the register; returns those in service, keyed by kind (the first of each). */
export async function seedDemoInstruments(ctx: TxContext): Promise<{ created: number; byKind: Map<InstrumentKind, string> }> {
  let created = 0;
  for (const i of DEMO_INSTRUMENTS) {
    const existing = await ctx.tx.execute<{ id: string }>(
      sql`select id from instrument where lower(maker) = lower(${i.maker}) and lower(model) = lower(${i.model}) and lower(serial) = lower(${i.serial})`,
    );
    if (existing.rows.length) continue;
    await ctx.tx.insert(instruments).values({
      kind: i.kind,
      maker: i.maker,
      model: i.model,
      serial: i.serial,
      calibratedOn: day(-i.calibratedDaysAgo),
      calibrationDueOn: day(i.dueInDays),
      retiredAt: i.retired ? new Date() : null,
    });
    created++;
  }
  // The bench's usual choice per kind: in service and within calibration.
  const rows = await ctx.tx.execute<{ id: string; kind: InstrumentKind }>(
    sql`select id, kind from instrument where retired_at is null and calibration_due_on >= current_date order by created_at`,
  );
  const byKind = new Map<InstrumentKind, string>();
  for (const r of rows.rows) if (!byKind.has(r.kind)) byKind.set(r.kind, r.id);
  return { created, byKind };
}
