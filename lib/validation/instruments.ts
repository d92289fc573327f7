import { z } from "@/lib/engine/zod";
import { INSTRUMENT_KINDS, INSTRUMENT_KIND_LABEL } from "@/lib/engine/instruments";

// The instrument register: the office form and the office JSON routes share these.

const allowedKinds = INSTRUMENT_KINDS.map((k) => INSTRUMENT_KIND_LABEL[k].toLowerCase()).join(", ");

const calendarDay = (label: string) =>
  z
    .string({ error: `${label}: use a date such as 2026-03-01.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${label}: use a date such as 2026-03-01.`)
    .refine((s) => {
      const d = new Date(`${s}T00:00:00Z`);
      return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s && s >= "1950-01-01" && s <= "2100-12-31";
    }, `${label}: that is not a calendar date between 1950 and 2100.`);

const name = (label: string, example: string) =>
  z
    .string({ error: `${label}: write it as on the instrument (${example}).` })
    .trim()
    .min(1, `${label}: write it as on the instrument (${example}).`)
    .max(80, `${label}: keep it under 80 characters.`);

export const instrumentCreateSchema = z
  .object({
    kind: z.enum(INSTRUMENT_KINDS, { error: `Kind: choose one of ${allowedKinds}.` }),
    maker: name("Maker", "Port Alder Instruments"),
    model: name("Model", "SG-40"),
    serial: name("Serial", "PA-1187"),
    calibratedOn: calendarDay("Last calibration"),
    calibrationDueOn: calendarDay("Calibration due"),
  })
  .refine((v) => v.calibrationDueOn >= v.calibratedOn, {
    path: ["calibrationDueOn"],
    message: "Calibration due: the due date cannot be before the last calibration.",
  });
export type InstrumentCreate = z.infer<typeof instrumentCreateSchema>;
export type InstrumentCreateInput = z.input<typeof instrumentCreateSchema>;

/** Retire or return to service, or record a new calibration (both dates together). */
export const instrumentUpdateSchema = z
  .object({
    retired: z.boolean({ error: "Retired: true or false." }).optional(),
    calibratedOn: calendarDay("Last calibration").optional(),
    calibrationDueOn: calendarDay("Calibration due").optional(),
  })
  .refine((v) => (v.calibratedOn === undefined) === (v.calibrationDueOn === undefined), {
    path: ["calibrationDueOn"],
    message: "A new calibration needs both dates: the last calibration and the next due date.",
  })
  .refine((v) => !v.calibratedOn || !v.calibrationDueOn || v.calibrationDueOn >= v.calibratedOn, {
    path: ["calibrationDueOn"],
    message: "Calibration due: the due date cannot be before the last calibration.",
  })
  .refine((v) => v.retired !== undefined || v.calibratedOn !== undefined, {
    path: ["retired"],
    message: "Say what changes: retired (true or false) or a new calibration.",
  });
export type InstrumentUpdate = z.infer<typeof instrumentUpdateSchema>;
