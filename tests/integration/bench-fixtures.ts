import { randomUUID } from "node:crypto";
import { DEMO } from "../support/accounts";
import { sql } from "../support/db";

// Jobs for bench scenarios, put in place directly; the transitions under test then go through the API.

export const AURELIAN_PROFILE = {
  kind: "tube-acdc",
  bands: [{ kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 }],
  electrolytics: 2,
  paperCapacitors: 6,
  tubes: 5,
  lineCordWorn: true,
  mainsVolts: 120,
  bPlusVolts: 120,
} as const;

export const CORVANE_PROFILE = {
  kind: "transistor-battery",
  bands: [{ kind: "MW", lowKHz: 530, highKHz: 1620, ifKHz: 455 }],
  electrolytics: 5,
  paperCapacitors: 0,
  transistors: 7,
  batteryCorrosion: true,
} as const;

export async function userId(email: string): Promise<string> {
  const [row] = await sql<{ id: string }>('select id from "user" where email = $1', [email]);
  if (!row) throw new Error(`no user ${email}`);
  return row.id;
}

export async function createJob({
  customerEmail = DEMO.customer.email,
  maker = "Aurelian",
  model = `5T-${randomUUID().slice(0, 4)}`,
  profile = AURELIAN_PROFILE as Record<string, unknown>,
  state = "requested",
  technicianEmail = null as string | null,
}: {
  customerEmail?: string;
  maker?: string;
  model?: string;
  profile?: Record<string, unknown>;
  state?: string;
  technicianEmail?: string | null;
} = {}): Promise<{ jobId: string; number: number; setId: string; model: string }> {
  const customerId = await userId(customerEmail);
  const technicianId = technicianEmail ? await userId(technicianEmail) : null;
  const [set] = await sql<{ id: string }>(
    "insert into radio_set (owner_id, maker, model, year, kind, profile) values ($1, $2, $3, 1948, $4, $5) returning id",
    [customerId, maker, model, String(profile.kind), JSON.stringify(profile)],
  );
  const [job] = await sql<{ id: string; number: number }>(
    "insert into job (set_id, customer_id, technician_id, state, symptoms) values ($1, $2, $3, $4, 'Hums loudly, no stations') returning id, number",
    [set!.id, customerId, technicianId, state],
  );
  return { jobId: job!.id, number: job!.number, setId: set!.id, model };
}

/** What the owner and the processor do between "estimate sent" and "on the bench": approve, pay the deposit. */
export async function approveAndPayDeposit(jobId: string): Promise<{ revisionId: string; totalMinor: number; depositMinor: number }> {
  const [rev] = await sql<{ id: string; total_minor: number; deposit_minor: number; currency: string }>(
    "update estimate_revision set status = 'approved', decided_at = now() where job_id = $1 and status = 'sent' returning id, total_minor, deposit_minor, currency",
    [jobId],
  );
  if (!rev) throw new Error("no sent revision to approve");
  await sql(
    "insert into payment (job_id, revision_id, purpose, amount_minor, currency, status, idempotency_key, paid_at) values ($1, $2, 'deposit', $3, $4, 'paid', $5, now())",
    [jobId, rev.id, rev.deposit_minor, rev.currency, `test-deposit-${randomUUID()}`],
  );
  await sql("update job set state = 'deposit_paid' where id = $1", [jobId]);
  return { revisionId: rev.id, totalMinor: rev.total_minor, depositMinor: rev.deposit_minor };
}

export async function historyAndAudit(jobId: string) {
  const history = await sql<{ from_state: string; to_state: string }>(
    "select from_state, to_state from job_state_history where job_id = $1 and from_state is not null order by at, id",
    [jobId],
  );
  const audits = await sql<{ before: { state: string }; after: { state: string } }>(
    "select before, after from audit_event where entity = 'job' and entity_id = $1 and action = 'job.transition' order by at, id",
    [jobId],
  );
  return { history, audits };
}
