import { z } from "@/lib/engine/zod";
import { WEEKDAY_NAMES } from "@/lib/engine/forecast/turnaround";

const hours = (day: string) =>
  z.coerce
    .number({ message: `${day}: enter the bench hours as a number from 0 to 16.` })
    .min(0, `${day}: enter the bench hours as a number from 0 to 16.`)
    .max(16, `${day}: enter the bench hours as a number from 0 to 16.`)
    .refine((h) => Number.isInteger(h * 4), `${day}: enter hours in quarters (for example 6 or 6.25).`);

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

function isCalendarDay(text: string): boolean {
  const m = DAY.exec(text);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === text;
}

/** Days off typed one per line or separated by commas, each as YYYY-MM-DD. */
const daysOff = z
  .string()
  .max(8_000, "Days off: list at most a year of days.")
  .transform((text, ctx) => {
    const items = text
      .split(/[\s,;]+/)
      .map((s) => s.trim())
      .filter(Boolean);
    const bad = items.find((s) => !isCalendarDay(s));
    if (bad) {
      ctx.addIssue({ code: "custom", message: `Days off: "${bad.slice(0, 20)}" is not a date; write each day as YYYY-MM-DD.` });
      return z.NEVER;
    }
    if (items.length > 400) {
      ctx.addIssue({ code: "custom", message: "Days off: list at most 400 days." });
      return z.NEVER;
    }
    return [...new Set(items)].sort();
  });

export const benchWeekSchema = z.object({
  userId: z.string().min(1, "Choose a member of staff.").max(100),
  monday: hours(WEEKDAY_NAMES[0]),
  tuesday: hours(WEEKDAY_NAMES[1]),
  wednesday: hours(WEEKDAY_NAMES[2]),
  thursday: hours(WEEKDAY_NAMES[3]),
  friday: hours(WEEKDAY_NAMES[4]),
  saturday: hours(WEEKDAY_NAMES[5]),
  sunday: hours(WEEKDAY_NAMES[6]),
  daysOff,
});
export type BenchWeekInput = z.input<typeof benchWeekSchema>;
export type BenchWeekValues = z.output<typeof benchWeekSchema>;

export const BENCH_WEEK_FIELDS = ["monday", "tuesday", "wednesday", "thursday", "friday", "saturday", "sunday"] as const;
