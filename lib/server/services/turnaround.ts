import "server-only";
import { listQueuedJobs, listStaffBenchWeeks, saveBenchWeek } from "@/db/queries/schedule";
import { transaction } from "@/db/transaction";
import {
  ASSUMED_BENCH_WEEK,
  forecastTurnaround,
  type BenchWeek,
  type ForecastTechnician,
  type JobForecast,
} from "@/lib/engine/forecast/turnaround";
import type { BenchWeekValues } from "@/lib/validation/bench-week";
import { BENCH_WEEK_FIELDS } from "@/lib/validation/bench-week";
import { audit } from "../audit";
import { AppError } from "../errors";
import { dayInZone } from "@/lib/engine/dates";
import { shopTimeZone } from "./shop";

/** Today as a calendar day where the shop works, in its time zone. */
async function shopToday(now = new Date()): Promise<string> {
  return dayInZone(now, await shopTimeZone());
}

function asWeek(minutes: number[] | undefined): BenchWeek | null {
  if (!minutes || minutes.length !== 7 || minutes.some((m) => !Number.isFinite(m) || m < 0)) return null;
  return minutes as unknown as BenchWeek;
}

/** Staff who count for the bench: technicians (the assumed week until the office sets theirs) and anyone whose week is set. */
export async function benchStaff() {
  const staff = await listStaffBenchWeeks();
  return staff.map((s) => {
    const set = asWeek(s.week?.minutes);
    const week = set ?? (s.role === "technician" ? ASSUMED_BENCH_WEEK : ([0, 0, 0, 0, 0, 0, 0] as const));
    return { id: s.id, name: s.name, role: s.role, assumed: !set, week, daysOff: s.week?.daysOff ?? [] };
  });
}

export async function shopForecast(now = new Date()) {
  const [staff, queued, today] = await Promise.all([benchStaff(), listQueuedJobs(), shopToday(now)]);
  const technicians: ForecastTechnician[] = staff
    .filter((s) => s.week.some((m) => m > 0))
    .map((s) => ({ id: s.id, week: s.week, daysOff: s.daysOff }));
  const forecast = forecastTurnaround({
    today,
    technicians,
    jobs: queued.map((j) => ({
      id: j.id,
      minutesLeft: j.minutes,
      queuedAt: new Date(j.queued_at).toISOString(),
      warranty: j.is_warranty,
      started: j.state === "on_bench" || j.state === "bench_revision",
      technicianId: j.technician_id,
    })),
  });
  return { ...forecast, queuedMinutes: queued.reduce((sum, j) => sum + j.minutes, 0), jobsWaiting: queued.length };
}

export type OwnerForecast =
  | { kind: "on-bench" }
  | { kind: "waiting"; position: number; ahead: number; startDay: string; endDay: string; awaitingDeposit: boolean }
  | { kind: "unknown" };

/** What the set owner is told about their job's place in the queue; null when the job is not waiting for the bench. */
export async function ownerForecast({ jobId, state }: { jobId: string; state: string }): Promise<OwnerForecast | null> {
  if (state === "on_bench" || state === "bench_revision") return { kind: "on-bench" };
  if (state !== "approved" && state !== "deposit_paid") return null;
  const f = await shopForecast();
  const mine = f.jobs.find((j: JobForecast) => j.id === jobId);
  if (!mine || mine.startDay === null) return { kind: "unknown" };
  return {
    kind: "waiting",
    position: mine.position,
    ahead: mine.position - 1,
    startDay: mine.startDay,
    endDay: mine.endDay,
    awaitingDeposit: state === "approved",
  };
}

export async function setBenchWeek({ input, actorId }: { input: BenchWeekValues; actorId: string }) {
  const staff = await listStaffBenchWeeks();
  const person = staff.find((s) => s.id === input.userId);
  if (!person) throw new AppError("not_found", "That member of staff was not found or is deactivated.");
  const minutes = BENCH_WEEK_FIELDS.map((f) => Math.round(input[f] * 60));
  await transaction(async (ctx) => {
    const before = await saveBenchWeek(ctx, { userId: input.userId, minutes, daysOff: input.daysOff, actorId });
    await audit(ctx, {
      actorId,
      action: "staff.bench-week",
      entity: "user",
      entityId: input.userId,
      before: before ? { minutes: before.minutes, daysOff: before.daysOff } : null,
      after: { minutes, daysOff: input.daysOff },
    });
  });
  return { ok: true as const };
}
