import { asc, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { benchWeeks, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";

/** Active staff with their bench week, if the office has set one. */
export async function listStaffBenchWeeks() {
  const rows = await db
    .select({ id: user.id, name: user.name, role: user.role, banned: user.banned })
    .from(user)
    .where(inArray(user.role, ["technician", "owner"]))
    .orderBy(asc(user.name));
  const weeks = await db.select().from(benchWeeks);
  const byUser = new Map(weeks.map((w) => [w.userId, w]));
  return rows
    .filter((r) => !r.banned)
    .map((r) => {
      const w = byUser.get(r.id);
      return { id: r.id, name: r.name, role: r.role, week: w ? { minutes: w.minutes, daysOff: w.daysOff } : null };
    });
}

export async function saveBenchWeek(
  ctx: TxContext,
  { userId, minutes, daysOff, actorId }: { userId: string; minutes: number[]; daysOff: string[]; actorId: string },
) {
  const [before] = await ctx.tx
    .select()
    .from(benchWeeks)
    .where(sql`${benchWeeks.userId} = ${userId}`)
    .for("update");
  await ctx.tx
    .insert(benchWeeks)
    .values({ userId, minutes, daysOff, updatedBy: actorId })
    .onConflictDoUpdate({ target: benchWeeks.userId, set: { minutes, daysOff, updatedBy: actorId, updatedAt: new Date() } });
  return before ?? null;
}

export type QueuedJobRow = {
  id: string;
  state: string;
  is_warranty: boolean;
  technician_id: string | null;
  minutes: number;
  queued_at: Date | string;
};

// Jobs waiting for or at the bench, with the bench minutes of their latest approved revision and the moment they
// joined the queue (when the deposit was paid, or approval when no deposit was asked; an approved job still
// waiting for its deposit joins now, behind everyone).
export async function listQueuedJobs(): Promise<QueuedJobRow[]> {
  const r = await db.execute<QueuedJobRow>(sql`
    select j.id, j.state, j.is_warranty, j.technician_id,
      coalesce((
        select sum(l.minutes * l.quantity) from estimate_line l
        where l.revision_id = (
          select r.id from estimate_revision r where r.job_id = j.id and r.status = 'approved' order by r.revision desc limit 1
        )
      ), 0)::int as minutes,
      (case when j.state = 'approved' then now() else coalesce(
        (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'deposit_paid'),
        (select min(h.at) from job_state_history h where h.job_id = j.id and h.to_state = 'approved'),
        j.updated_at
      ) end) as queued_at
    from job j
    where j.state in ('approved', 'deposit_paid', 'on_bench', 'bench_revision')
  `);
  return r.rows;
}
