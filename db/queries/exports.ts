import { sql } from "drizzle-orm";
import { db } from "@/db";

// Rows for the office's CSV exports, in a half-open range of instants [start, end). Amounts stay in minor units
// with the currency's exponent beside them; the service writes the decimal amounts.

export type PaymentExportRow = {
  kind: "payment" | "refund" | "waiver";
  at: Date;
  job_number: number;
  customer_name: string;
  customer_email: string;
  purpose: string;
  status: string;
  amount_minor: number;
  currency: string;
  exponent: number;
  reference: string | null;
  reason: string | null;
  /** card, cash or cheque (the payment's, for a refund); empty for a waiver. */
  method: string | null;
  /** The receipt or refund note issued for the row. */
  document: string | null;
  /** A refund's kind: "return" (money paid beyond the total) or "reduction" (the price lowered); null otherwise. */
  refund_kind: string | null;
};

/**
 * Payments received by card, cash or cheque (by the day they were recorded; a voided entry is left out), refunds confirmed (by the day they settled), and remainders the
 * shop waived because they were below the smallest card payment (by the day they were waived).
 */
export async function paymentExportRows(start: Date, end: Date): Promise<PaymentExportRow[]> {
  const r = await db.execute<PaymentExportRow>(sql`
    select * from (
      select 'payment' as kind, p.paid_at as at, j.number as job_number, u.name as customer_name, u.email as customer_email,
             p.purpose::text as purpose, p.status::text as status, p.amount_minor, p.currency,
             coalesce((r.pricing->>'exponent')::int, 2) as exponent, coalesce(p.payment_intent_id, p.cheque_number) as reference,
             null::text as reason, p.method::text as method, d.number as document, null::text as refund_kind
      from payment p join job j on j.id = p.job_id join "user" u on u.id = j.customer_id
      join estimate_revision r on r.id = p.revision_id
      left join money_document d on d.payment_id = p.id and d.kind = 'receipt'
      where p.paid_at is not null and p.status in ('paid', 'duplicate')
        and p.paid_at >= ${start.toISOString()} and p.paid_at < ${end.toISOString()}
      union all
      select 'refund', f.settled_at, j.number, u.name, u.email, p.purpose::text, f.status::text, f.amount_minor, p.currency,
             coalesce((r.pricing->>'exponent')::int, 2), f.processor_refund_id, f.reason, p.method::text, d.number, f.kind::text
      from refund f join payment p on p.id = f.payment_id join job j on j.id = p.job_id join "user" u on u.id = j.customer_id
      join estimate_revision r on r.id = p.revision_id
      left join money_document d on d.refund_id = f.id and d.kind = 'refund'
      where f.status = 'succeeded' and f.settled_at >= ${start.toISOString()} and f.settled_at < ${end.toISOString()}
      union all
      select 'waiver', j.waived_at, j.number, u.name, u.email, 'balance', 'waived', j.waived_minor, a.currency,
             coalesce((a.pricing->>'exponent')::int, 2), null, 'below the smallest card payment', null, null, null
      from job j join "user" u on u.id = j.customer_id
      join lateral (select r.currency, r.pricing from estimate_revision r where r.job_id = j.id and r.status = 'approved' order by r.revision desc limit 1) a on true
      where j.waived_minor > 0 and j.waived_at >= ${start.toISOString()} and j.waived_at < ${end.toISOString()}
    ) x order by at, kind, job_number
  `);
  return r.rows;
}

export type JobExportRow = {
  number: number;
  created_at: Date;
  state: string;
  is_warranty: boolean;
  customer_name: string;
  customer_email: string;
  maker: string;
  model: string;
  year: number | null;
  technician_name: string | null;
  approved_total_minor: number | null;
  currency: string | null;
  exponent: number | null;
  returned_at: Date | null;
};

/** Jobs opened in the range, with the approved total of their latest approved revision. */
export async function jobExportRows(start: Date, end: Date): Promise<JobExportRow[]> {
  const r = await db.execute<JobExportRow>(sql`
    select j.number, j.created_at, j.state::text as state, j.is_warranty, u.name as customer_name, u.email as customer_email,
           s.maker, s.model, s.year, t.name as technician_name,
           coalesce(j.settled_total_minor, a.total_minor) as approved_total_minor, a.currency,
           coalesce((a.pricing->>'exponent')::int, 2) as exponent, j.returned_at
    from job j join "user" u on u.id = j.customer_id join radio_set s on s.id = j.set_id
    left join "user" t on t.id = j.technician_id
    left join lateral (
      select r.total_minor, r.currency, r.pricing from estimate_revision r
      where r.job_id = j.id and r.status = 'approved' order by r.revision desc limit 1
    ) a on true
    where j.created_at >= ${start.toISOString()} and j.created_at < ${end.toISOString()}
    order by j.number
  `);
  return r.rows;
}

export type TaxExportRow = {
  month: string;
  currency: string;
  exponent: number;
  jobs: number;
  labour_tax_minor: number;
  parts_tax_minor: number;
};

/**
 * Tax collected per month: a job's tax (labour and parts apart, as priced on its approved revision) counts in the
 * month the job was paid in full, the moment the whole amount, tax included, was collected.
 */
export async function taxExportRows(start: Date, end: Date): Promise<TaxExportRow[]> {
  const r = await db.execute<TaxExportRow>(sql`
    with settled as (
      select j.id, min(h.at) as at from job j join job_state_history h on h.job_id = j.id and h.to_state = 'paid_in_full'
      group by j.id
    )
    select to_char(date_trunc('month', s.at at time zone 'UTC'), 'YYYY-MM') as month, a.currency,
           coalesce((a.pricing->>'exponent')::int, 2) as exponent, count(*)::int as jobs,
           coalesce(sum((a.pricing->>'labourTaxMinor')::bigint), 0)::float8 as labour_tax_minor,
           coalesce(sum((a.pricing->>'partsTaxMinor')::bigint), 0)::float8 as parts_tax_minor
    from settled s
    join lateral (
      select r.currency, r.pricing from estimate_revision r where r.job_id = s.id and r.status = 'approved' order by r.revision desc limit 1
    ) a on true
    where s.at >= ${start.toISOString()} and s.at < ${end.toISOString()}
    group by 1, 2, 3 order by 1, 2
  `);
  return r.rows.map((x) => ({ ...x, labour_tax_minor: Number(x.labour_tax_minor), parts_tax_minor: Number(x.parts_tax_minor) }));
}

export type AuditExportRow = {
  at: Date;
  actor_name: string | null;
  actor_email: string | null;
  action: string;
  entity: string;
  entity_id: string;
  before: unknown;
  after: unknown;
};

export async function auditExportRows(start: Date, end: Date): Promise<AuditExportRow[]> {
  const r = await db.execute<AuditExportRow>(sql`
    select e.at, u.name as actor_name, u.email as actor_email, e.action, e.entity, e.entity_id, e.before, e.after
    from audit_event e left join "user" u on u.id = e.actor_id
    where e.at >= ${start.toISOString()} and e.at < ${end.toISOString()}
    order by e.at, e.id
  `);
  return r.rows;
}
