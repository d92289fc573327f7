// Turnaround forecast: expected bench days worked out by hand on the calendar. Weekdays of the dates used were
// read from the calendar (GNU `date -d 2026-12-07 +%A` → Monday; 2026-12-24 Thursday, 2026-12-25 Friday,
// 2026-12-28 Monday). A first-come, first-served queue worked one job at a time by each technician is the
// shop's own rule (common practice for a small repair bench); warranty work goes first (common practice).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { forecastTurnaround, type BenchWeek, type ForecastJob, type ForecastTechnician } from "@/lib/engine/forecast/turnaround";

const WEEKDAYS_4H: BenchWeek = [240, 240, 240, 240, 240, 0, 0];
const tech = (id: string, week: BenchWeek = WEEKDAYS_4H, daysOff: string[] = []): ForecastTechnician => ({ id, week, daysOff });
const job = (id: string, minutesLeft: number, queuedAt: string, extra: Partial<ForecastJob> = {}): ForecastJob => ({
  id,
  minutesLeft,
  queuedAt,
  warranty: false,
  technicianId: null,
  ...extra,
});
const days = (f: ReturnType<typeof forecastTurnaround>) =>
  Object.fromEntries(f.jobs.map((j) => [j.id, [j.startDay, j.endDay, j.position]]));

describe("turnaround forecast", () => {
  it("works the queue in order: 300 min from Monday fills Monday's 240 and an hour of Tuesday; the next job starts Tuesday", () => {
    const f = forecastTurnaround({
      today: "2026-12-07",
      technicians: [tech("t1")],
      jobs: [job("B", 200, "2026-11-20T10:00:00Z"), job("A", 300, "2026-11-19T10:00:00Z")],
    });
    expect(days(f)).toEqual({ A: ["2026-12-07", "2026-12-08", 1], B: ["2026-12-08", "2026-12-09", 2] });
  });

  it("skips the weekend: a full week of work ends Friday and the next job starts Monday", () => {
    const f = forecastTurnaround({
      today: "2026-12-07",
      technicians: [tech("t1")],
      jobs: [job("A", 1200, "2026-11-19T10:00:00Z"), job("B", 10, "2026-11-20T10:00:00Z")],
    });
    expect(days(f)).toEqual({ A: ["2026-12-07", "2026-12-11", 1], B: ["2026-12-14", "2026-12-14", 2] });
  });

  it("skips days off: from Wednesday 23 December with the 24th and 25th off, a day's work runs into Monday the 28th", () => {
    const f = forecastTurnaround({
      today: "2026-12-23",
      technicians: [tech("t1", WEEKDAYS_4H, ["2026-12-24", "2026-12-25"])],
      jobs: [job("A", 480, "2026-12-01T10:00:00Z")],
    });
    expect(days(f)).toEqual({ A: ["2026-12-23", "2026-12-28", 1] });
  });

  it("puts a warranty job ahead of paid work that joined earlier", () => {
    const f = forecastTurnaround({
      today: "2026-12-07",
      technicians: [tech("t1")],
      jobs: [job("paid", 240, "2026-11-01T10:00:00Z"), job("warranty", 240, "2026-12-05T10:00:00Z", { warranty: true })],
    });
    expect(days(f)).toEqual({ warranty: ["2026-12-07", "2026-12-07", 1], paid: ["2026-12-08", "2026-12-08", 2] });
  });

  it("finishes the set already on the bench before starting warranty work that is waiting", () => {
    const f = forecastTurnaround({
      today: "2026-12-07",
      technicians: [tech("t1")],
      jobs: [job("warranty", 240, "2026-12-05T10:00:00Z", { warranty: true }), job("open", 120, "2026-11-01T10:00:00Z", { started: true })],
    });
    expect(days(f)).toEqual({ open: ["2026-12-07", "2026-12-07", 1], warranty: ["2026-12-07", "2026-12-08", 2] });
  });

  it("shares unassigned work between technicians and keeps assigned work with its technician", () => {
    const f = forecastTurnaround({
      today: "2026-12-07",
      technicians: [tech("t1"), tech("t2")],
      jobs: [
        job("A", 480, "2026-11-01T10:00:00Z"),
        job("B", 240, "2026-11-02T10:00:00Z"),
        job("C", 240, "2026-11-03T10:00:00Z"),
        job("D", 60, "2026-11-04T10:00:00Z", { technicianId: "t1" }),
      ],
    });
    // A takes t1 Monday and Tuesday; B takes t2 Monday; C goes to t2 (free Tuesday, before t1 on Wednesday);
    // D is t1's own and waits for t1 on Wednesday although t2 is free sooner.
    expect(days(f)).toEqual({
      A: ["2026-12-07", "2026-12-08", 1],
      B: ["2026-12-07", "2026-12-07", 2],
      C: ["2026-12-08", "2026-12-08", 3],
      D: ["2026-12-09", "2026-12-09", 4],
    });
    expect(f.jobs.find((j) => j.id === "D")?.technicianId).toBe("t1");
  });

  it("states the backlog in weeks of the shop's bench time, and says so when there is no bench time at all", () => {
    const jobs = [job("A", 1200, "2026-11-01T10:00:00Z"), job("B", 1200, "2026-11-02T10:00:00Z")];
    // 2,400 minutes over two technicians of 20 hours a week (2,400 minutes) = 1 week.
    expect(forecastTurnaround({ today: "2026-12-07", technicians: [tech("t1"), tech("t2")], jobs }).backlogWeeks).toBe(1);
    const none = forecastTurnaround({ today: "2026-12-07", technicians: [], jobs });
    expect(none.backlogWeeks).toBeNull();
    expect(none.jobs.every((j) => j.startDay === null && "reason" in j)).toBe(true);
  });

  it("never lets a later job of the same technician finish before an earlier one (one job at a time)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 2000 }), { minLength: 1, maxLength: 12 }), (minutes) => {
        const f = forecastTurnaround({
          today: "2026-12-07",
          technicians: [tech("t1")],
          jobs: minutes.map((m, i) => job(`j${i}`, m, new Date(Date.UTC(2026, 10, 1, 0, i)).toISOString())),
        });
        for (let i = 1; i < f.jobs.length; i++) expect(f.jobs[i]!.endDay! >= f.jobs[i - 1]!.endDay!).toBe(true);
        for (const j of f.jobs) expect(j.startDay! <= j.endDay!).toBe(true);
      }),
    );
  });

  it("refuses a day that is not a calendar day", () => {
    expect(() => forecastTurnaround({ today: "7/12/2026", technicians: [], jobs: [] })).toThrow(/YYYY-MM-DD/);
  });
});
