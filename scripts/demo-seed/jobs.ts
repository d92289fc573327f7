import { and, eq, sql } from "drizzle-orm";
import { estimates, jobs, payments, radioSets } from "@/db/schema";
import type { JobState } from "@/db/schema/enums";
import type { TxContext } from "@/db/transaction";
import { setProfileSchema, type SetProfileInput } from "@/lib/engine/checklist/profile";
import { approveRevision, declineRevision } from "@/lib/server/services/approvals";
import {
  askQuestion,
  beginFinalChecks,
  completeJob,
  declineJob,
  recordReturn,
  requiredReadingsFor,
  saveReading,
  setTask,
  startBenchWork,
  startTriage,
} from "@/lib/server/services/bench";
import { decideClaim, openClaim } from "@/lib/server/services/claims";
import { buildDraft, saveDraft, sendRevision } from "@/lib/server/services/estimates";
import { issueInvoice, issueReceipt } from "@/lib/server/services/document-numbers";
import { recordJobCreated, transitionJob } from "@/lib/server/services/jobs";
import { getShop } from "@/lib/server/services/shop";
import { judgeReading } from "@/lib/engine/verdicts";
import type { DraftLine } from "@/lib/validation/estimate";
import { instrumentKindsFor, type InstrumentKind, type ReadingPhase } from "@/lib/engine/instruments";
import type { ReadingRequirement } from "@/lib/engine/verdicts";
import { seedDemoInstruments } from "./instruments";
import { seedDemoParts } from "./parts";
import { checklistCatalogue } from "@/lib/server/services/parts";

const TOMAS = "demo-tech-tomas";
const PRIYA = "demo-tech-priya";

const AURELIAN_5T: SetProfileInput = {
  kind: "tube-acdc",
  bands: [{ kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455, label: "Broadcast" }],
  electrolytics: 2,
  paperCapacitors: 8,
  tubes: 5,
  ifTransformers: 2,
  seleniumRectifier: true,
  lineCordWorn: true,
  mainsVolts: 120,
  symptoms: ["hum", "weak"],
};
const CORVANE_7: SetProfileInput = {
  kind: "transistor-battery",
  bands: [{ kind: "MW", lowKHz: 530, highKHz: 1620, ifKHz: 455, label: "AM" }],
  electrolytics: 6,
  paperCapacitors: 0,
  transistors: 7,
  ifTransformers: 3,
  batteryCorrosion: true,
  dialCordBroken: false,
  symptoms: ["noisy-controls", "intermittent"],
};
const HALDANE_CONSOLE: SetProfileInput = {
  kind: "tube-transformer",
  bands: [
    { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455, label: "Standard" },
    { kind: "SW", lowKHz: 5900, highKHz: 9900, ifKHz: 455, label: "SW 1" },
    { kind: "SW", lowKHz: 9400, highKHz: 18000, ifKHz: 455, label: "SW 2" },
    { kind: "FM", lowKHz: 88000, highKHz: 108000, ifKHz: 10700, label: "FM" },
  ],
  electrolytics: 4,
  paperCapacitors: 22,
  tubes: 9,
  ifTransformers: 2,
  ifTransformersFm: 3,
  dialCordBroken: true,
  mainsVolts: 120,
  bPlusVolts: 250,
  symptoms: ["no-sound"],
};

type DemoJob = {
  key: string;
  customerId: string;
  technicianId?: string;
  maker: string;
  model: string;
  year?: number;
  serial?: string;
  profile: SetProfileInput;
  symptoms: string;
  priorWork?: string;
  target: JobState;
  daysAgo: number;
  claim?: boolean;
  /** A scope change sent while the set is on the bench, approved by the owner and settled in the balance. */
  benchRevision?: boolean;
  /** After the return, a claim accepted and its warranty job taken all the way to its own certificate. */
  warrantyJob?: boolean;
  /** Readings taken as received (when the set came in) as well as as returned, each with its instrument. */
  bothPhases?: boolean;
};

// One set for every state a job can be in, all from the invented makers of the demo shop.
const DEMO_JOBS: DemoJob[] = [
  {
    key: "demo-returned",
    customerId: "demo-cust-mira",
    technicianId: TOMAS,
    maker: "Aurelian",
    model: 'Model 5T-52 "Parlour"',
    year: 1952,
    serial: "AU52-118304",
    profile: AURELIAN_5T,
    symptoms: "Loud hum, stations fade after ten minutes.",
    priorWork: "Grandfather replaced one tube in the 1970s.",
    target: "returned",
    daysAgo: 40,
    claim: true,
    bothPhases: true,
  },
  {
    key: "demo-requested",
    customerId: "demo-cust-jonah",
    maker: "Corvane",
    model: "Skylark Seven",
    year: 1963,
    profile: CORVANE_7,
    symptoms: "Crackles when the volume is turned; cuts out.",
    target: "requested",
    daysAgo: 1,
  },
  {
    key: "demo-triage",
    customerId: "demo-cust-mira",
    technicianId: PRIYA,
    maker: "Corvane",
    model: "Pocket Six",
    year: 1961,
    profile: { ...CORVANE_7, transistors: 6 },
    symptoms: "Dead. Battery box was green when I opened it.",
    target: "in_triage",
    daysAgo: 3,
  },
  {
    key: "demo-question",
    customerId: "demo-cust-jonah",
    technicianId: TOMAS,
    maker: "Haldane",
    model: "Tablette 4",
    year: 1958,
    profile: { ...HALDANE_CONSOLE, bands: [HALDANE_CONSOLE.bands[0]!, HALDANE_CONSOLE.bands[3]!], tubes: 6 },
    symptoms: "FM works, AM silent.",
    target: "awaiting_owner",
    daysAgo: 5,
  },
  {
    key: "demo-estimate",
    customerId: "demo-cust-walt",
    technicianId: TOMAS,
    maker: "Aurelian",
    model: "Model 5T-48",
    year: 1948,
    serial: "AU48-20771",
    profile: { ...AURELIAN_5T, seleniumRectifier: false },
    symptoms: "Found in the attic of the estate; not powered in decades.",
    target: "estimate_sent",
    daysAgo: 6,
  },
  {
    key: "demo-approved",
    customerId: "demo-cust-ines",
    technicianId: PRIYA,
    maker: "Aurelian",
    model: 'Model 6T "Traveller"',
    year: 1955,
    profile: { ...AURELIAN_5T, tubes: 6 },
    symptoms: "Works but hums and the dial lamp is out.",
    target: "approved",
    daysAgo: 8,
  },
  {
    key: "demo-deposit",
    customerId: "demo-cust-walt",
    technicianId: PRIYA,
    maker: "Corvane",
    model: "Skylark Seven",
    year: 1964,
    profile: CORVANE_7,
    symptoms: "Weak and distorted.",
    target: "deposit_paid",
    daysAgo: 10,
  },
  {
    key: "demo-bench",
    customerId: "demo-cust-ines",
    technicianId: TOMAS,
    maker: "Haldane",
    model: "Console 8-SW",
    year: 1957,
    serial: "HC-57-0912",
    profile: HALDANE_CONSOLE,
    symptoms: "No sound on any band; the dial cord is slipping.",
    priorWork: "A local shop replaced the power cord in 1990.",
    target: "on_bench",
    daysAgo: 14,
  },
  {
    key: "demo-final",
    customerId: "demo-cust-mira",
    technicianId: PRIYA,
    maker: "Haldane",
    model: "Console 6",
    year: 1956,
    profile: { ...HALDANE_CONSOLE, bands: [HALDANE_CONSOLE.bands[0]!, HALDANE_CONSOLE.bands[1]!] },
    symptoms: "Hum and no shortwave.",
    target: "final_checks",
    daysAgo: 18,
  },
  {
    key: "demo-balance",
    customerId: "demo-cust-jonah",
    technicianId: TOMAS,
    maker: "Aurelian",
    model: "Model 5T-50",
    year: 1950,
    profile: AURELIAN_5T,
    symptoms: "Smelled hot the last time it was switched on.",
    target: "balance_due",
    daysAgo: 22,
  },
  {
    key: "demo-paid",
    customerId: "demo-cust-ines",
    technicianId: PRIYA,
    maker: "Corvane",
    model: "Pocket Six",
    year: 1962,
    profile: { ...CORVANE_7, transistors: 6 },
    symptoms: "Stations drift after a few minutes.",
    target: "paid_in_full",
    daysAgo: 26,
  },
  {
    key: "demo-declined-owner",
    customerId: "demo-cust-walt",
    technicianId: TOMAS,
    maker: "Haldane",
    model: "Console 8-SW",
    year: 1959,
    profile: HALDANE_CONSOLE,
    symptoms: "Cabinet fine, chassis untested.",
    target: "declined_by_owner",
    daysAgo: 12,
  },
  {
    key: "demo-declined-shop",
    customerId: "demo-cust-jonah",
    technicianId: PRIYA,
    maker: "Corvane",
    model: "Marina",
    year: 1966,
    profile: CORVANE_7,
    symptoms: "Dropped into the sea; case cracked.",
    target: "declined_by_shop",
    daysAgo: 9,
  },
  {
    key: "demo-cancelled",
    customerId: "demo-cust-ines",
    maker: "Aurelian",
    model: "Model 5T-52",
    year: 1953,
    profile: AURELIAN_5T,
    symptoms: "Sister found it working after all.",
    target: "cancelled",
    daysAgo: 4,
  },
  {
    key: "demo-warranty-source",
    customerId: "demo-cust-jonah",
    technicianId: TOMAS,
    maker: "Aurelian",
    model: "Model 5T-50 Mantel",
    year: 1950,
    serial: "AU50-207716",
    profile: AURELIAN_5T,
    symptoms: "Dead: the pilot lamp glows but there is no sound at all.",
    target: "returned",
    daysAgo: 70,
    warrantyJob: true,
  },
  {
    key: "demo-bench-revision",
    customerId: "demo-cust-mira",
    technicianId: PRIYA,
    maker: "Corvane",
    model: "Skylark Five",
    year: 1961,
    profile: CORVANE_7,
    symptoms: "Plays for a minute, then fades to a whisper.",
    target: "paid_in_full",
    daysAgo: 18,
    benchRevision: true,
  },
];

const ORDER: JobState[] = [
  "requested",
  "in_triage",
  "estimate_sent",
  "approved",
  "deposit_paid",
  "on_bench",
  "final_checks",
  "balance_due",
  "paid_in_full",
  "returned",
];

function reached(target: JobState, step: JobState): boolean {
  const t = ORDER.indexOf(target);
  return t >= 0 && t >= ORDER.indexOf(step);
}

// Stands in for the processor's confirmed webhook: demo data only, never used by the app itself.
/**
 * A paid deposit or balance with its receipt (and the invoice once paid in full). By card through the processor
 * unless `counter` names who took cash or a cheque at the counter and how.
 */
export async function recordDemoPayment(
  ctx: TxContext,
  job: { id: string; key: string },
  purpose: "deposit" | "balance",
  to: JobState,
  counter?: { method: "cash" | "cheque"; chequeNumber?: string; takenBy: string },
) {
  const [rev] = await ctx.tx
    .execute<{ id: string; total_minor: number; deposit_minor: number; currency: string }>(
      sql`select id, total_minor, deposit_minor, currency from estimate_revision where job_id = ${job.id} and status = 'approved' order by revision desc limit 1`,
    )
    .then((r) => r.rows);
  if (!rev) throw new Error(`demo job ${job.key} has no approved revision`);
  const paid = await ctx.tx
    .execute<{ n: number }>(sql`select coalesce(sum(amount_minor), 0)::int as n from payment where job_id = ${job.id} and status = 'paid'`)
    .then((r) => r.rows[0]!.n);
  const amount = purpose === "deposit" ? rev.deposit_minor : rev.total_minor - paid;
  const [payment] = await ctx.tx
    .insert(payments)
    .values({
      jobId: job.id,
      revisionId: rev.id,
      purpose,
      amountMinor: amount,
      currency: rev.currency,
      status: "paid",
      ...(counter
        ? {
            method: counter.method,
            chequeNumber: counter.chequeNumber ?? null,
            receivedOn: new Date().toISOString().slice(0, 10),
            createdBy: counter.takenBy,
          }
        : {
            checkoutSessionId: `cs_demo_${job.key.replace(/-/g, "_")}_${purpose}`,
            paymentIntentId: `pi_demo_${job.key.replace(/-/g, "_")}_${purpose}`,
          }),
      idempotencyKey: `demo:${job.key}:${purpose}`,
      paidAt: new Date(),
    })
    .returning({ id: payments.id });
  await issueReceipt(ctx, payment!.id);
  await transitionJob(ctx, {
    jobId: job.id,
    to,
    actor: "system",
    actorId: null,
    note: counter
      ? `${purpose === "deposit" ? "Deposit" : "Balance"} received by ${counter.method} at the counter`
      : purpose === "deposit"
        ? "Deposit confirmed by the processor"
        : "Balance confirmed by the processor",
  });
  if (to === "paid_in_full") await issueInvoice(ctx, job.id);
}

type Instruments = Map<InstrumentKind, string>;

// The demo instrument of the reading's usual kind (the first kind it is taken with that the demo shop has).
function instrumentFor(req: ReadingRequirement, byKind: Instruments | undefined): string | undefined {
  if (!byKind) return undefined;
  for (const kind of instrumentKindsFor(req)) if (byKind.has(kind)) return byKind.get(kind);
  return undefined;
}

// How the set measured when it came in: dial edges and tracking off, leakage high, B+ low.
function asReceivedValue(req: ReadingRequirement): number {
  if (req.unit === "mA") return 0.42;
  if (req.unit === "V") return req.nominal !== null ? Math.round(req.nominal * 0.86) : 104;
  return (req.nominal ?? 455) + (req.key.includes("edge.high") ? -24 : 14);
}

async function requirementsOf(ctx: TxContext, jobId: string): Promise<ReadingRequirement[]> {
  const shop = await getShop(ctx.tx);
  const [row] = await ctx.tx
    .execute<{ profile: Record<string, unknown> }>(
      sql`select s.profile from job j join radio_set s on s.id = j.set_id where j.id = ${jobId}`,
    )
    .then((r) => r.rows);
  const codes = await ctx.tx
    .execute<{ code: string }>(
      sql`select l.code from estimate_line l join estimate_revision r on r.id = l.revision_id where r.job_id = ${jobId} and r.status = 'approved' and l.category <> 'parts'`,
    )
    .then((r) => r.rows.map((x) => x.code));
  return requiredReadingsFor(setProfileSchema.parse(row!.profile), shop.policy.tolerances, codes);
}

export async function recordAsReceived(ctx: TxContext, jobId: string, actorId: string, byKind: Instruments) {
  const phase: ReadingPhase = "as_received";
  for (const req of await requirementsOf(ctx, jobId)) {
    await saveReading(ctx, {
      jobId,
      actorId,
      input: { key: req.key, value: asReceivedValue(req), note: undefined, phase, instrumentId: instrumentFor(req, byKind) },
    });
  }
}

export async function passAllReadings(ctx: TxContext, jobId: string, actorId: string, byKind?: Instruments) {
  const reqs = await requirementsOf(ctx, jobId);
  for (const req of reqs) {
    let value = req.nominal ?? (req.unit === "mA" ? 0.12 : 118);
    // A realistic small deviation where the tolerance allows it.
    const nudged = req.nominal != null ? req.nominal + (req.unit === "kHz" ? 2 : 0) : value;
    if (judgeReading(req, nudged).verdict === "pass") value = nudged;
    await saveReading(ctx, {
      jobId,
      actorId,
      input: {
        key: req.key,
        value,
        note: undefined,
        ...(byKind ? { phase: "as_returned" as const, instrumentId: instrumentFor(req, byKind) } : {}),
      },
    });
  }
  const tasks = await ctx.tx.execute<{ code: string }>(sql`select code from job_task where job_id = ${jobId}`).then((r) => r.rows);
  for (const t of tasks) await setTask(ctx, { jobId, actorId, code: t.code, done: true });
}

async function advance(ctx: TxContext, job: DemoJob & { id: string }, byKind: Instruments) {
  const tech = job.technicianId ?? TOMAS;
  const t = job.target;
  if (t === "requested") return;
  if (t === "cancelled") {
    await transitionJob(ctx, {
      jobId: job.id,
      to: "cancelled",
      actor: "customer",
      actorId: job.customerId,
      note: "The owner withdrew the request",
    });
    return;
  }
  await startTriage(ctx, { jobId: job.id, actorId: tech });
  if (t === "in_triage") return;
  if (t === "awaiting_owner") {
    await askQuestion(ctx, {
      jobId: job.id,
      actorId: tech,
      question: "Does the dial pointer move when you turn the tuning knob? A photo of the back of the chassis would help too.",
      idempotencyKey: `demo:${job.key}:question`,
    });
    return;
  }
  if (t === "declined_by_shop") {
    await declineJob(ctx, {
      jobId: job.id,
      actorId: tech,
      reason: "Sea water has corroded the board beyond repair; we would only be able to salvage the case.",
    });
    return;
  }
  const shop = await getShop(ctx.tx);
  const profile = setProfileSchema.parse(job.profile);
  const [est] = await ctx.tx.select({ version: estimates.version }).from(estimates).where(eq(estimates.jobId, job.id)).limit(1);
  await saveDraft(ctx, {
    jobId: job.id,
    actorId: tech,
    version: est?.version ?? 0,
    lines: buildDraft(profile, shop.policy, await checklistCatalogue(ctx.tx)),
  });
  const { revisionId } = await sendRevision(ctx, { jobId: job.id, actorId: tech });
  if (t === "estimate_sent") return;
  if (t === "declined_by_owner") {
    await declineRevision(ctx, {
      jobId: job.id,
      customerId: job.customerId,
      revisionId,
      reason: "More than the set is worth to me; I will keep it as a display piece.",
    });
    return;
  }
  await approveRevision(ctx, { jobId: job.id, customerId: job.customerId, revisionId });
  if (!reached(t, "deposit_paid")) return;
  await recordDemoPayment(ctx, { id: job.id, key: job.key }, "deposit", "deposit_paid");
  if (!reached(t, "on_bench")) return;
  await startBenchWork(ctx, { jobId: job.id, actorId: tech });
  if (job.benchRevision) await benchScopeChange(ctx, job.id, job.customerId, tech);
  if (job.bothPhases) await recordAsReceived(ctx, job.id, tech, byKind);
  if (!reached(t, "final_checks")) return;
  await passAllReadings(ctx, job.id, tech, job.bothPhases ? byKind : undefined);
  await beginFinalChecks(ctx, { jobId: job.id, actorId: tech });
  if (!reached(t, "balance_due")) return;
  await completeJob(ctx, { jobId: job.id, actorId: tech });
  if (!reached(t, "paid_in_full")) return;
  await recordDemoPayment(ctx, { id: job.id, key: job.key }, "balance", "paid_in_full");
  if (!reached(t, "returned")) return;
  const { certificateId } = await recordReturn(ctx, {
    jobId: job.id,
    actorId: tech,
    input: { method: "shipped", carrier: "Port Alder Parcel", trackingNumber: "PAP 2026 0417" },
  });
  if (job.warrantyJob) await warrantyToCertificate(ctx, { certificateId, customerId: job.customerId, tech });
  if (job.claim) {
    await openClaim(ctx, {
      claimantId: job.customerId,
      certificateId,
      symptomCategory: "hum",
      description: "A low hum came back after about half an hour of playing, louder than when it arrived.",
      statements: [],
      photos: [],
    } as Parameters<typeof openClaim>[1]);
  }
}

// The dial cord parts during the work: a revision sent from the bench, approved; the set never leaves it.
async function benchScopeChange(ctx: TxContext, jobId: string, customerId: string, tech: string) {
  const [est] = await ctx.tx
    .select({ version: estimates.version, draft: estimates.draft })
    .from(estimates)
    .where(eq(estimates.jobId, jobId));
  const lines = (est!.draft as { lines: DraftLine[] }).lines;
  const base = lines.find((l) => l.kind === "labour")!;
  const restring: DraftLine = {
    ...base,
    key: "mech.dial-cord-restring",
    code: "mech.dial-cord-restring",
    title: "Restring the dial cord",
    category: "mechanical",
    minutes: 45,
    quantity: 1,
    reason: "The dial cord parted while the gang was being cleaned.",
    readings: [],
  };
  await saveDraft(ctx, { jobId, actorId: tech, version: est!.version, lines: [...lines, restring] });
  const { revisionId } = await sendRevision(ctx, {
    jobId,
    actorId: tech,
    changeSummary: "The dial cord parted while the gang was being cleaned; it needs restringing (45 minutes).",
  });
  await approveRevision(ctx, { jobId, customerId, revisionId });
}

// A claim on the returned set, accepted: its warranty job (covered lines at no charge) goes through the bench,
// moves on by itself with nothing to pay, and is returned with a certificate of its own.
async function warrantyToCertificate(
  ctx: TxContext,
  { certificateId, customerId, tech }: { certificateId: string; customerId: string; tech: string },
) {
  const claim = await openClaim(ctx, {
    claimantId: customerId,
    certificateId,
    symptomCategory: "hum",
    description: "A hum came back after a few weeks of evening listening.",
    statements: [],
    photos: [],
  } as Parameters<typeof openClaim>[1]);
  const { warrantyJobId } = await decideClaim(ctx, {
    claimId: claim.id,
    actorId: tech,
    decision: "accept",
    reason: "One of the filter capacitors we fitted has failed early.",
    findings: [],
  });
  const jobId = warrantyJobId!;
  const { revisionId } = await sendRevision(ctx, { jobId, actorId: tech });
  await approveRevision(ctx, { jobId, customerId, revisionId });
  await startBenchWork(ctx, { jobId, actorId: tech });
  await passAllReadings(ctx, jobId, tech);
  await beginFinalChecks(ctx, { jobId, actorId: tech });
  await completeJob(ctx, { jobId, actorId: tech });
  await recordReturn(ctx, { jobId, actorId: tech, input: { method: "pick-up" } });
}

// Spreads the demo history over past weeks so lists, timelines and reports look lived-in; the latest
// move of each job stays at today, so a certificate's own dates match its job's timeline.
export async function backdate(ctx: TxContext, jobId: string, daysAgo: number) {
  const start = sql`now() - make_interval(days => ${daysAgo})`;
  await ctx.tx.execute(sql`
    with h as (select id, row_number() over (order by at, ctid) - 1 as i, count(*) over () as n from job_state_history where job_id = ${jobId})
    update job_state_history s set at = ${start} + (h.i * (${daysAgo}::numeric / greatest(h.n - 1, 1))) * interval '1 day'
    from h where s.id = h.id`);
  await ctx.tx.execute(
    sql`update job set created_at = ${start}, received_at = case when state in ('on_bench','final_checks','balance_due','paid_in_full','returned') then ${start} + interval '3 days' else received_at end where id = ${jobId}`,
  );
  await ctx.tx.execute(
    sql`update job set updated_at = (select max(at) from job_state_history where job_id = ${jobId}) where id = ${jobId}`,
  );
  await ctx.tx.execute(sql`
    update payment p set paid_at = h.at, created_at = h.at
    from job_state_history h
    where p.job_id = ${jobId} and h.job_id = ${jobId}
      and h.to_state = (case when p.purpose = 'deposit' then 'deposit_paid' else 'paid_in_full' end)::job_state`);
}

export async function seedDemoJobs(ctx: TxContext): Promise<number> {
  let created = 0;
  const { byKind } = await seedDemoInstruments(ctx);
  // Before the jobs: their approved estimates take counted parts from stock.
  await seedDemoParts(ctx);
  for (const demo of DEMO_JOBS) {
    const [existing] = await ctx.tx
      .select({ id: jobs.id })
      .from(jobs)
      .where(and(eq(jobs.customerId, demo.customerId), eq(jobs.idempotencyKey, demo.key)))
      .limit(1);
    if (existing) continue;
    const profile = setProfileSchema.parse(demo.profile);
    const [set] = await ctx.tx
      .insert(radioSets)
      .values({
        ownerId: demo.customerId,
        maker: demo.maker,
        model: demo.model,
        year: demo.year ?? null,
        serial: demo.serial ?? null,
        kind: profile.kind,
        profile: profile as unknown as Record<string, unknown>,
      })
      .returning({ id: radioSets.id });
    const [job] = await ctx.tx
      .insert(jobs)
      .values({
        setId: set!.id,
        customerId: demo.customerId,
        technicianId: demo.technicianId ?? null,
        symptoms: demo.symptoms,
        priorWork: demo.priorWork ?? "",
        poweredRecently: "no",
        delivery: "mail-in",
        cautionsAcknowledgedAt: new Date(),
        idempotencyKey: demo.key,
      })
      .returning({ id: jobs.id });
    await recordJobCreated(ctx, { jobId: job!.id, actorId: demo.customerId });
    await advance(ctx, { ...demo, id: job!.id }, byKind);
    await backdate(ctx, job!.id, demo.daysAgo);
    created++;
  }
  return created;
}
