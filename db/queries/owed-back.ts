import { sql } from "drizzle-orm";
import { db } from "@/db";

export type OwedBackCandidate = {
  jobId: string;
  jobNumber: number;
  state: string;
  customerName: string;
  currency: string;
  totalMinor: number;
  /** A remainder the shop waived (below the processor's smallest charge). */
  waivedMinor: number;
  anyStale: boolean;
  payments: { amountMinor: number; status: string }[];
  refunds: { amountMinor: number; status: string; kind: string }[];
};

// Jobs on which money may be owed back: any job with a paid payment, with what its account is made of
// (the newest approved total or the settled total, the paid payments, every refund). The office applies the
// one account rule to these rows; nothing is summed here.
export async function listOwedBackCandidates(): Promise<OwedBackCandidate[]> {
  const rows = await db.execute<{
    job_id: string;
    number: number;
    state: string;
    customer_name: string;
    currency: string;
    total_minor: number | null;
    waived_minor: number;
    any_stale: boolean;
    payments: { amountMinor: number; status: string }[];
    refunds: { amountMinor: number; status: string; kind: string }[] | null;
  }>(sql`
    select j.id as job_id, j.number, j.state, u.name as customer_name,
      coalesce(r.currency, min(p.currency)) as currency,
      coalesce(j.settled_total_minor, r.total_minor, 0) as total_minor,
      j.waived_minor,
      bool_or(p.arrived_stale) as any_stale,
      json_agg(json_build_object('amountMinor', p.amount_minor, 'status', p.status)) as payments,
      (select json_agg(json_build_object('amountMinor', f.amount_minor, 'status', f.status, 'kind', f.kind))
         from refund f join payment fp on fp.id = f.payment_id where fp.job_id = j.id) as refunds
    from job j
    join "user" u on u.id = j.customer_id
    join payment p on p.job_id = j.id and p.status = 'paid'
    left join lateral (
      select er.total_minor, er.currency from estimate_revision er
      where er.job_id = j.id and er.status = 'approved' order by er.revision desc limit 1
    ) r on true
    group by j.id, u.name, r.total_minor, r.currency
    order by j.number desc
    limit 500`);
  return rows.rows.map((r) => ({
    jobId: r.job_id,
    jobNumber: Number(r.number),
    state: r.state,
    customerName: r.customer_name,
    currency: r.currency,
    totalMinor: Number(r.total_minor ?? 0),
    waivedMinor: Number(r.waived_minor ?? 0),
    anyStale: Boolean(r.any_stale),
    payments: r.payments,
    refunds: r.refunds ?? [],
  }));
}
