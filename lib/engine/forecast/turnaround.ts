// When will a set reach the bench? The queue is worked in order (sets already on the bench first, then warranty
// jobs, then by the time each job joined the queue), each technician taking the next job that is theirs or unassigned, one job at a time, for
// as many minutes a day as their bench week gives them, skipping their days off. The answer per job is the day
// its first minute is worked and the day its last minute is: a range the owner can plan around.

/** Bench minutes per weekday, Monday first. */
export type BenchWeek = readonly [number, number, number, number, number, number, number];

/**
 * Counted for a technician whose bench week the office has not set: six bench hours a day, Monday to Friday (an
 * assumption of this shop's, shown on the staff page, not a trade figure).
 */
export const ASSUMED_BENCH_WEEK: BenchWeek = [360, 360, 360, 360, 360, 0, 0];

export const WEEKDAY_NAMES = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"] as const;

export type ForecastTechnician = {
  id: string;
  week: BenchWeek;
  /** Calendar days (YYYY-MM-DD) with no bench time: holidays, leave, trade fairs. */
  daysOff: readonly string[];
};

export type ForecastJob = {
  id: string;
  /** Approved bench minutes not yet worked. */
  minutesLeft: number;
  /** When the job joined the bench queue (ISO instant); earlier goes first. */
  queuedAt: string;
  /** Warranty work goes ahead of paid work. */
  warranty: boolean;
  /** Already on the bench: finished before anything waiting is started. */
  started?: boolean;
  /** The technician it is assigned to, or null for whoever is free first. */
  technicianId: string | null;
};

export type JobForecast =
  | { id: string; position: number; technicianId: string; startDay: string; endDay: string }
  | { id: string; position: number; technicianId: null; startDay: null; endDay: null; reason: "no-bench-time" };

export type TurnaroundForecast = {
  jobs: JobForecast[];
  /** Minutes of approved work in the queue over the shop's bench minutes in a normal week. */
  backlogWeeks: number | null;
};

const DAY_MS = 86_400_000;
/** Look no further than two years ahead; past that the shop has no bench time to speak of. */
const HORIZON_DAYS = 731;

function dayNumber(day: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  if (!m) throw new RangeError(`Not a calendar day (YYYY-MM-DD): ${day}`);
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) / DAY_MS;
}

function dayString(n: number): string {
  return new Date(n * DAY_MS).toISOString().slice(0, 10);
}

/** Monday 0 … Sunday 6. 1970-01-01 (day 0) was a Thursday. */
function weekdayIndex(n: number): number {
  return (((n + 3) % 7) + 7) % 7;
}

/** The queue's working order: work already started, then warranty, then the time each job joined, then its id. */
export function queueOrder<T extends Pick<ForecastJob, "id" | "queuedAt" | "warranty" | "started">>(jobs: readonly T[]): T[] {
  return [...jobs].sort(
    (a, b) =>
      Number(Boolean(b.started)) - Number(Boolean(a.started)) ||
      Number(b.warranty) - Number(a.warranty) ||
      Date.parse(a.queuedAt) - Date.parse(b.queuedAt) ||
      (a.id < b.id ? -1 : a.id > b.id ? 1 : 0),
  );
}

type Cursor = { day: number; usedToday: number };

function capacity(t: ForecastTechnician, off: Set<number>, day: number): number {
  return off.has(day) ? 0 : Math.max(0, t.week[weekdayIndex(day)]);
}

/** Where the technician would start and finish `minutes` of work from the cursor; null past the horizon. */
function place(t: ForecastTechnician, off: Set<number>, from: Cursor, minutes: number, lastDay: number) {
  let day = from.day;
  let used = from.usedToday;
  let left = Math.max(0, minutes);
  let start: number | null = null;
  for (; day <= lastDay; day++, used = 0) {
    const free = capacity(t, off, day) - used;
    if (free <= 0) continue;
    if (start === null) start = day;
    if (left <= free) {
      // Zero-minute jobs take their place in the queue on the first bench day.
      return { start, end: day, cursor: { day, usedToday: used + left } };
    }
    left -= free;
  }
  return null;
}

export function forecastTurnaround(input: {
  today: string;
  jobs: readonly ForecastJob[];
  technicians: readonly ForecastTechnician[];
}): TurnaroundForecast {
  const first = dayNumber(input.today);
  const lastDay = first + HORIZON_DAYS;
  const techs = input.technicians.map((t) => ({
    t,
    off: new Set(t.daysOff.map(dayNumber)),
    cursor: { day: first, usedToday: 0 } as Cursor,
  }));
  const byId = new Map(techs.map((x) => [x.t.id, x]));

  const jobs: JobForecast[] = queueOrder(input.jobs).map((job, i) => {
    const position = i + 1;
    const assigned = job.technicianId ? byId.get(job.technicianId) : undefined;
    const candidates = assigned ? [assigned] : techs;
    let best: { who: (typeof techs)[number]; placed: NonNullable<ReturnType<typeof place>> } | null = null;
    for (const who of candidates) {
      const placed = place(who.t, who.off, who.cursor, job.minutesLeft, lastDay);
      if (!placed) continue;
      if (!best || placed.end < best.placed.end || (placed.end === best.placed.end && placed.start < best.placed.start))
        best = { who, placed };
    }
    if (!best) return { id: job.id, position, technicianId: null, startDay: null, endDay: null, reason: "no-bench-time" };
    best.who.cursor = best.placed.cursor;
    return {
      id: job.id,
      position,
      technicianId: best.who.t.id,
      startDay: dayString(best.placed.start),
      endDay: dayString(best.placed.end),
    };
  });

  const weekly = input.technicians.reduce((sum, t) => sum + t.week.reduce((a, b) => a + Math.max(0, b), 0), 0);
  const queued = input.jobs.reduce((sum, j) => sum + Math.max(0, j.minutesLeft), 0);
  return { jobs, backlogWeeks: weekly > 0 ? Math.round((queued / weekly) * 10) / 10 : null };
}
