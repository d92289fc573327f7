import { sql } from "drizzle-orm";
import { db } from "@/db";
import { JOB_STATES, type JobState } from "@/db/schema/enums";

/** Months are calendar months in UTC, written "YYYY-MM"; `to` is inclusive. */
export type MonthRange = { from: string; to: string };

export function monthsOf({ from, to }: MonthRange): string[] {
  const out: string[] = [];
  let [y, m] = from.split("-").map(Number) as [number, number];
  const [ty, tm] = to.split("-").map(Number) as [number, number];
  while (y < ty || (y === ty && m <= tm)) {
    out.push(`${y}-${String(m).padStart(2, "0")}`);
    m++;
    if (m > 12) {
      m = 1;
      y++;
    }
  }
  return out;
}

export function rangeBounds({ from, to }: MonthRange): { start: Date; end: Date } {
  const start = new Date(`${from}-01T00:00:00Z`);
  const end = new Date(`${to}-01T00:00:00Z`);
  end.setUTCMonth(end.getUTCMonth() + 1);
  return { start, end };
}

/** Jobs opened in the range, by the state they are in now. */
export async function jobsPerStateForOwner(range: MonthRange): Promise<{ state: JobState; count: number }[]> {
  const { start, end } = rangeBounds(range);
  const r = await db.execute<{ state: JobState; n: number }>(sql`
    select state, count(*)::int as n from job
    where created_at >= ${start.toISOString()} and created_at < ${end.toISOString()}
    group by state
  `);
  const byState = new Map(r.rows.map((row) => [row.state, row.n]));
  return JOB_STATES.map((state) => ({ state, count: byState.get(state) ?? 0 }));
}

// Receipt is job.received_at, or the first move onto the bench; return is job.returned_at, or the move to returned.
const TURNAROUND_ROWS = sql`
  with spans as (
    select
      j.id,
      coalesce(j.received_at, (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'on_bench')) as started,
      coalesce(j.returned_at, (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'returned')) as ended
    from job j
    where j.state = 'returned' or j.returned_at is not null
  )
  select id, started, ended, (extract(epoch from (ended - started)) / 86400.0)::float8 as days
  from spans
  where started is not null and ended is not null and ended >= started
`;

export type Turnaround = { jobs: number; medianDays: number | null; byMonth: { month: string; jobs: number; medianDays: number | null }[] };

/** Median days from receipt to return, for jobs returned in the range, overall and per month of return. */
export async function turnaroundForOwner(range: MonthRange): Promise<Turnaround> {
  const { start, end } = rangeBounds(range);
  const [overall, monthly] = await Promise.all([
    db.execute<{ n: number; median: number | null }>(sql`
      select count(*)::int as n, percentile_cont(0.5) within group (order by t.days) as median
      from (${TURNAROUND_ROWS}) t
      where t.ended >= ${start.toISOString()} and t.ended < ${end.toISOString()}
    `),
    db.execute<{ month: string; n: number; median: number | null }>(sql`
      select to_char(date_trunc('month', t.ended at time zone 'UTC'), 'YYYY-MM') as month, count(*)::int as n,
             percentile_cont(0.5) within group (order by t.days) as median
      from (${TURNAROUND_ROWS}) t
      where t.ended >= ${start.toISOString()} and t.ended < ${end.toISOString()}
      group by 1
    `),
  ]);
  const byMonth = new Map(monthly.rows.map((m) => [m.month, m]));
  return {
    jobs: overall.rows[0]?.n ?? 0,
    medianDays: overall.rows[0]?.median ?? null,
    byMonth: monthsOf(range).map((month) => ({ month, jobs: byMonth.get(month)?.n ?? 0, medianDays: byMonth.get(month)?.median ?? null })),
  };
}

export type MoneyMonth = { month: string; depositsMinor: number; balancesMinor: number; refundsMinor: number; netMinor: number };

/**
 * Money received per month of payment (deposits and balances), refunds per month they were confirmed,
 * and net revenue = deposits + balances − refunds.
 */
export async function moneyPerMonthForOwner(range: MonthRange): Promise<MoneyMonth[]> {
  const { start, end } = rangeBounds(range);
  const [paid, refunded] = await Promise.all([
    db.execute<{ month: string; deposits: number; balances: number }>(sql`
      select to_char(date_trunc('month', paid_at at time zone 'UTC'), 'YYYY-MM') as month,
             coalesce(sum(amount_minor) filter (where purpose = 'deposit'), 0)::float8 as deposits,
             coalesce(sum(amount_minor) filter (where purpose = 'balance'), 0)::float8 as balances
      from payment
      where status = 'paid' and paid_at >= ${start.toISOString()} and paid_at < ${end.toISOString()}
      group by 1
    `),
    db.execute<{ month: string; refunds: number }>(sql`
      select to_char(date_trunc('month', settled_at at time zone 'UTC'), 'YYYY-MM') as month,
             coalesce(sum(amount_minor), 0)::float8 as refunds
      from refund
      where status = 'succeeded' and settled_at >= ${start.toISOString()} and settled_at < ${end.toISOString()}
      group by 1
    `),
  ]);
  const p = new Map(paid.rows.map((r) => [r.month, r]));
  const f = new Map(refunded.rows.map((r) => [r.month, r]));
  return monthsOf(range).map((month) => {
    const depositsMinor = Number(p.get(month)?.deposits ?? 0);
    const balancesMinor = Number(p.get(month)?.balances ?? 0);
    const refundsMinor = Number(f.get(month)?.refunds ?? 0);
    return { month, depositsMinor, balancesMinor, refundsMinor, netMinor: depositsMinor + balancesMinor - refundsMinor };
  });
}

/** The range asked for, or the twelve months up to this one; at most ten years. */
export function resolveMonthRange({ from, to }: { from?: string; to?: string }, now = new Date()): MonthRange {
  const month = (d: Date) => `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, "0")}`;
  const end = to ?? (from && from > month(now) ? from : month(now));
  let start = from;
  if (!start) {
    const d = new Date(`${end}-01T00:00:00Z`);
    d.setUTCMonth(d.getUTCMonth() - 11);
    start = month(d);
  }
  const months = monthsOf({ from: start, to: end });
  if (months.length > 120) start = months[months.length - 120]!;
  return { from: start, to: end };
}

export async function reportsForOwner(range: MonthRange) {
  const [jobsPerState, turnaround, money] = await Promise.all([
    jobsPerStateForOwner(range),
    turnaroundForOwner(range),
    moneyPerMonthForOwner(range),
  ]);
  return { range, jobsPerState, turnaround, money };
}
export type Reports = Awaited<ReturnType<typeof reportsForOwner>>;
