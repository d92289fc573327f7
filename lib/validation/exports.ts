import { z } from "@/lib/engine/zod";

export const EXPORT_FILES = ["payments.csv", "jobs.csv", "tax.csv", "audit.csv"] as const;
export type ExportFile = (typeof EXPORT_FILES)[number];

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

function isCalendarDay(text: string): boolean {
  const m = DAY.exec(text);
  if (!m) return false;
  return new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]))).toISOString().slice(0, 10) === text;
}

const day = (field: string) => z.string().refine(isCalendarDay, `${field}: write the day as YYYY-MM-DD (for example 2026-11-01).`);

/** The export's days, both included; at most ten years. */
export const exportRangeSchema = z
  .object({ from: day("From"), to: day("To") })
  .refine((r) => r.from <= r.to, { path: ["to"], message: "To: choose a day on or after the From day." })
  .refine((r) => Date.parse(r.to) - Date.parse(r.from) <= 3_653 * 86_400_000, {
    path: ["to"],
    message: "To: an export covers at most ten years; choose a shorter range.",
  });
export type ExportRange = z.infer<typeof exportRangeSchema>;
