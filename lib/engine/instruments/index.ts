import { parseReadingKey } from "../verdicts/reading-keys";
import type { JobState } from "../jobs/states";

// The shop's test instruments, which reading is taken with which kind, and the two phases a reading can
// belong to. Pure tables: the office page, the bench sheet and the certificate all read them.

export const INSTRUMENT_KINDS = [
  "signal_generator",
  "frequency_counter",
  "meter",
  "oscilloscope",
  "sweep_generator",
  "leakage_tester",
  "tube_tester",
] as const;
export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number];

export const INSTRUMENT_KIND_LABEL: Record<InstrumentKind, string> = {
  signal_generator: "Signal generator",
  frequency_counter: "Frequency counter",
  meter: "Meter",
  oscilloscope: "Oscilloscope",
  sweep_generator: "Sweep or tracking generator",
  leakage_tester: "Leakage tester",
  tube_tester: "Tube tester",
};

export function isInstrumentKind(value: unknown): value is InstrumentKind {
  return typeof value === "string" && (INSTRUMENT_KINDS as readonly string[]).includes(value);
}

/**
 * The instrument kinds a reading is taken with, the usual one first (common practice on the bench):
 * - received frequency at a dial mark: the signal generator that the set is tuned to, read off its dial or a counter;
 * - the LO: a frequency counter loosely coupled to the oscillator (or a generator zero-beaten against it);
 * - the IF peak: a signal generator, a sweep generator with its display, or the counter on the generator;
 * - leakage current: a leakage tester, or a meter across the measuring network;
 * - B+ and the mains beside it: a meter.
 * A reading this table does not know is offered by its unit: frequencies as above, volts and milliamps a meter.
 */
export function instrumentKindsFor(reading: { key: string; unit: string }): readonly InstrumentKind[] {
  const p = parseReadingKey(reading.key);
  switch (p?.kind) {
    case "edge":
    case "track":
      return ["signal_generator", "frequency_counter"];
    case "lo":
      return ["frequency_counter", "signal_generator"];
    case "if-peak":
      return ["signal_generator", "sweep_generator", "frequency_counter"];
    case "leakage":
      return ["leakage_tester", "meter"];
    case "bplus":
    case "bplus-mains":
      return ["meter"];
  }
  if (reading.unit === "kHz" || reading.unit === "MHz" || reading.unit === "Hz") return ["signal_generator", "frequency_counter"];
  if (reading.unit === "V" || reading.unit === "mA" || reading.unit === "A" || reading.unit === "Ω") return ["meter"];
  return [...INSTRUMENT_KINDS];
}

/**
 * Within calibration through its due date, overdue from the day after (dates as YYYY-MM-DD, compared as
 * calendar days; common practice for a calibration label's "due" date).
 */
export function isCalibrationOverdue(dueOn: string, takenOn: string): boolean {
  return takenOn > dueOn;
}

export const READING_PHASES = ["as_received", "as_returned"] as const;
export type ReadingPhase = (typeof READING_PHASES)[number];

export const READING_PHASE_LABEL: Record<ReadingPhase, string> = {
  as_received: "As received",
  as_returned: "As returned",
};

/** What a reading stored without a phase is: the figure the verdicts and the certificate's band edges use. */
export const DEFAULT_STORED_PHASE: ReadingPhase = "as_returned";

/**
 * The phase the bench sheet proposes: a set just in (on the bench, no checklist line ticked yet) is measured
 * as received; once work has begun, and at final checks, readings describe the set as it goes back. The
 * technician can switch either way.
 */
export function defaultReadingPhase({ state, linesTicked }: { state: JobState; linesTicked: number }): ReadingPhase {
  if ((state === "on_bench" || state === "bench_revision") && linesTicked === 0) return "as_received";
  return "as_returned";
}

/**
 * The instrument a reading row proposes: the technician's last choice for the row's usual kind, else for
 * its other kinds in order, as long as that instrument is still offered (not retired).
 */
export function proposedInstrument(
  kinds: readonly InstrumentKind[],
  lastChoice: Readonly<Partial<Record<InstrumentKind, string>>>,
  offered: readonly { id: string; kind: InstrumentKind }[],
): string | null {
  for (const kind of kinds) {
    const id = lastChoice[kind];
    if (id && offered.some((i) => i.id === id && i.kind === kind)) return id;
  }
  return null;
}
