import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { db, type Database } from "@/db";
import {
  getJobDetailForStaff,
  listAssignableStaff,
  listRevisionDecisionsForStaff,
  listHistoryForStaff,
  listMessagesForStaff,
  listPhotosForStaff,
} from "@/db/queries/bench";
import { getApprovedRevisionWithLines, getLatestRevisionWithLines } from "@/db/queries/estimates";
import { instruments, jobs, jobTasks, messages, radioSets, readings, user } from "@/db/schema";
import type { JobState } from "@/lib/engine/jobs/states";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { isMainsSet, type SetProfile } from "@/lib/engine/checklist/profile";
import { env } from "@/lib/server/env";
import { shownEmail } from "@/lib/engine/contacts";
import { AppError } from "@/lib/server/errors";
import { jobNumber, STATE_LABEL } from "@/lib/engine/jobs/states";
import { queueEmail } from "@/lib/server/mail";
import { issueCertificate } from "@/lib/server/services/certificates";
import { checkProfile } from "@/lib/server/services/estimates";
import { transitionJob } from "@/lib/server/services/jobs";
import { jobShipToLines, snapshotDefaultReturnAddress } from "@/lib/server/services/owner-account";
import { settleIfNothingOwed } from "@/lib/server/services/account";
import { findKeyedMessage } from "@/lib/server/services/messages";
import { getShop } from "@/lib/server/services/shop";
import { loadSweeps, performanceRequirementsFor, sweepStrips, sweepViews } from "@/lib/server/services/performance";
import { judgeReading, judgeReadings, listRequiredReadings, readingValueProblem, type ReadingRequirement } from "@/lib/engine/verdicts";
import type { ProfileUpdate, ReadingInput, ReturnInput } from "@/lib/validation/bench";
import {
  DEFAULT_STORED_PHASE,
  defaultReadingPhase,
  instrumentKindsFor,
  isCalibrationOverdue,
  type ReadingPhase,
} from "@/lib/engine/instruments";
import {
  instrumentForReading,
  lastInstrumentChoices,
  listOfferedInstruments,
  rememberInstrumentChoice,
  todayUtc,
} from "@/lib/server/services/instruments";
import { moneyText } from "@/lib/validation/estimate";

type JobRow = typeof jobs.$inferSelect;

async function loadJob(tx: Database, jobId: string, { lock = false } = {}) {
  const q = tx
    .select({ job: jobs, set: radioSets, customer: { id: user.id, name: user.name, email: user.email } })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  const [row] = lock ? await q.for("update", { of: jobs }) : await q;
  if (!row) throw new AppError("not_found", "That job was not found.");
  return row;
}

function requireState(job: JobRow, allowed: readonly JobState[], doing: string): void {
  if (!allowed.includes(job.state)) {
    throw new AppError("invalid_transition", `You cannot ${doing} while the job is "${STATE_LABEL[job.state].staff}".`);
  }
}

const portalUrl = (jobId: string) => `${env().APP_URL}/portal/jobs/${jobId}`;
const setName = (set: { maker: string; model: string }) => `${set.maker} ${set.model}`;

// ---- Triage -------------------------------------------------------------------------------------------

/** A technician picks up a new request; it becomes theirs unless someone already has it. */
export async function startTriage(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  const { job } = await loadJob(ctx.tx, jobId);
  return transitionJob(ctx, {
    jobId,
    to: "in_triage",
    actor: "staff",
    actorId,
    note: "Picked up for triage",
    patch: job.technicianId ? undefined : { technicianId: actorId },
  });
}

const PROFILE_STATES: readonly JobState[] = [
  "requested",
  "in_triage",
  "awaiting_owner",
  "estimate_sent",
  "approved",
  "deposit_paid",
  "on_bench",
];

/** Corrects the set profile that drives the checklist and the bench sheet. */
export async function updateProfile(ctx: TxContext, { jobId, actorId, input }: { jobId: string; actorId: string; input: ProfileUpdate }) {
  const { job, set } = await loadJob(ctx.tx, jobId, { lock: true });
  requireState(job, PROFILE_STATES, "change the set profile");
  // What the owner reported with the request stays beside the technician's profile, whatever is edited.
  const ownerReport = (set.profile as Record<string, unknown>).ownerReport;
  const profile = { ...(input.profile as Record<string, unknown>), ...(ownerReport === undefined ? {} : { ownerReport }) };
  await ctx.tx
    .update(radioSets)
    .set({ maker: input.maker, model: input.model, year: input.year ?? null, kind: input.profile.kind, profile, updatedAt: new Date() })
    .where(eq(radioSets.id, set.id));
  await audit(ctx, {
    actorId,
    action: "set.profile.update",
    entity: "radio_set",
    entityId: set.id,
    before: { maker: set.maker, model: set.model, year: set.year, profile: set.profile },
    after: { maker: input.maker, model: input.model, year: input.year ?? null, profile },
  });
  return { setId: set.id };
}

/**
 * Asks the owner a question: a message they see, an e-mail, and the job waits on them. The same key again
 * (a retry after a lost answer) returns the first question without a second message, e-mail or move.
 */
export async function askQuestion(
  ctx: TxContext,
  { jobId, actorId, question, idempotencyKey }: { jobId: string; actorId: string; question: string; idempotencyKey: string },
) {
  const { job, set, customer } = await loadJob(ctx.tx, jobId, { lock: true });
  const existing = await findKeyedMessage(ctx, {
    jobId,
    authorId: actorId,
    idempotencyKey,
    body: question,
    internal: false,
    isQuestion: true,
  });
  if (existing) return { messageId: existing.id, duplicate: true };
  requireState(job, ["in_triage"], "ask the owner a question");
  const [msg] = await ctx.tx
    .insert(messages)
    .values({ jobId, authorId: actorId, body: question, isQuestion: true, internal: false, idempotencyKey })
    .returning({ id: messages.id });
  await transitionJob(ctx, { jobId, to: "awaiting_owner", actor: "staff", actorId, note: "Question sent to the owner" });
  await queueEmail(ctx, {
    to: customer.email,
    template: "shop-question",
    props: { name: customer.name, jobNumber: jobNumber(job.number), setName: setName(set), question, url: portalUrl(jobId) },
    dedupeKey: `shop-question:${msg!.id}`,
  });
  return { messageId: msg!.id, duplicate: false };
}

/** The shop turns the job down; the reason is kept as a message the owner can read. */
export async function declineJob(ctx: TxContext, { jobId, actorId, reason }: { jobId: string; actorId: string; reason: string }) {
  const { job } = await loadJob(ctx.tx, jobId);
  requireState(job, ["in_triage"], "decline the job");
  await ctx.tx.insert(messages).values({ jobId, authorId: actorId, body: `The shop cannot take this job: ${reason}`, internal: false });
  return transitionJob(ctx, { jobId, to: "declined_by_shop", actor: "staff", actorId, note: reason });
}

/** Gives the job to a technician (or to nobody); refuses people who are not active staff. */
export async function assignTechnician(
  ctx: TxContext,
  { jobId, actorId, technicianId }: { jobId: string; actorId: string; technicianId: string | null },
) {
  const { job } = await loadJob(ctx.tx, jobId, { lock: true });
  if (technicianId) {
    const [tech] = await ctx.tx
      .select({ id: user.id, role: user.role, banned: user.banned })
      .from(user)
      .where(eq(user.id, technicianId))
      .limit(1);
    if (!tech || tech.banned || (tech.role !== "technician" && tech.role !== "owner")) {
      throw new AppError("invalid_input", "Choose an active member of the workshop.", {
        technicianId: "Choose an active member of the workshop.",
      });
    }
  }
  if (job.technicianId === technicianId) return { changed: false };
  await ctx.tx
    .update(jobs)
    .set({ technicianId, version: job.version + 1, updatedAt: new Date() })
    .where(eq(jobs.id, jobId));
  await audit(ctx, {
    actorId,
    action: "job.assign",
    entity: "job",
    entityId: jobId,
    before: { technicianId: job.technicianId },
    after: { technicianId },
  });
  return { changed: true };
}

// ---- Bench sheet ---------------------------------------------------------------------------------------

/** The set has arrived after the deposit: work starts. */
export async function startBenchWork(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  const { job } = await loadJob(ctx.tx, jobId);
  return transitionJob(ctx, {
    jobId,
    to: "on_bench",
    actor: "staff",
    actorId,
    note: "Set received, work started",
    patch: { receivedAt: job.receivedAt ?? new Date(), ...(job.technicianId ? {} : { technicianId: actorId }) },
  });
}

/**
 * The readings this job must have: what the profile calls for on the lines of the revision the owner
 * approved (or the newest one), and the leakage test on every mains set whatever the estimate says.
 */
export function requiredReadingsFor(
  profile: SetProfile,
  tolerances: Parameters<typeof listRequiredReadings>[1],
  lineCodes: readonly string[] | null,
): ReadingRequirement[] {
  const all = listRequiredReadings(profile, tolerances);
  if (!lineCodes) return all;
  const lines = new Set(lineCodes);
  const mains = isMainsSet(profile.kind);
  return all.filter((r) => lines.has(r.lineCode) || (mains && r.lineCode === "test.leakage"));
}

async function sheetBasis(tx: Database, jobId: string, set: { profile: Record<string, unknown> }) {
  const profile = checkProfile(set.profile);
  if (!profile.ok)
    return { profile: null, requirements: [] as ReadingRequirement[], lines: [] as { code: string; title: string; kind: string }[] };
  const shop = await getShop(tx);
  const rev = (await getApprovedRevisionWithLines({ jobId }, tx)) ?? (await getLatestRevisionWithLines({ jobId }, tx));
  const labour = rev ? rev.lines.filter((l) => l.category !== "parts") : null;
  const requirements = requiredReadingsFor(profile.profile, shop.policy.tolerances, labour ? labour.map((l) => l.code) : null);
  return { profile: profile.profile, requirements, lines: (labour ?? []).map((l) => ({ code: l.code, title: l.title, kind: l.category })) };
}

// While a revision waits for the owner the set stays on the bench and the approved work goes on.
const READING_STATES: readonly JobState[] = ["on_bench", "bench_revision", "final_checks"];

/**
 * Stores one reading, in its phase (as received or as returned), with its verdict against the tolerance in
 * force and the instrument it was taken with (flagged when that instrument's calibration was overdue on the
 * day); re-measuring in the same phase overwrites it.
 */
export async function saveReading(ctx: TxContext, { jobId, actorId, input }: { jobId: string; actorId: string; input: ReadingInput }) {
  // Every bench write takes the job's row lock, as completion does: a reading either lands before the
  // completion gate reads the sheet, or waits and then finds the job no longer on the bench.
  const { job, set } = await loadJob(ctx.tx, jobId, { lock: true });
  requireState(job, READING_STATES, "record readings");
  const { requirements, profile } = await sheetBasis(ctx.tx, jobId, set);
  // Performance readings are offered only on a job the technician opted in; they never gate completion.
  const performance = (await performanceRequirementsFor(ctx.tx, jobId, profile)).requirements;
  const requirement = requirements.find((r) => r.key === input.key) ?? performance.find((r) => r.key === input.key);
  if (!requirement)
    throw new AppError("invalid_input", "This set does not call for that reading.", { key: "This set does not call for that reading." });
  const problem = input.value === null ? null : readingValueProblem(requirement, input.value);
  if (problem) throw new AppError("invalid_input", problem, { value: problem });
  const judged = judgeReading(requirement, input.value);
  const now = new Date();
  const phase: ReadingPhase = input.phase ?? DEFAULT_STORED_PHASE;
  const instrument = input.instrumentId
    ? await instrumentForReading(ctx.tx, { instrumentId: input.instrumentId, kinds: instrumentKindsFor(requirement) })
    : null;
  const instrumentOverdue = instrument ? isCalibrationOverdue(instrument.calibrationDueOn, todayUtc(now)) : false;
  const [before] = await ctx.tx
    .select()
    .from(readings)
    .where(and(eq(readings.jobId, jobId), eq(readings.key, input.key), eq(readings.phase, phase)))
    .limit(1);
  const values = {
    value: input.value,
    unit: requirement.unit,
    note: input.note || null,
    verdict: judged.verdict,
    toleranceText: judged.toleranceText,
    recordedBy: actorId,
    recordedAt: now,
    instrumentId: instrument?.id ?? null,
    instrumentOverdue,
  };
  await ctx.tx
    .insert(readings)
    .values({ jobId, key: input.key, phase, ...values })
    .onConflictDoUpdate({ target: [readings.jobId, readings.key, readings.phase], set: values });
  if (instrument) await rememberInstrumentChoice(ctx, { userId: actorId, instrument });
  await audit(ctx, {
    actorId,
    action: "reading.record",
    entity: "job",
    entityId: jobId,
    before: before
      ? { key: before.key, phase: before.phase, value: before.value, verdict: before.verdict, instrumentId: before.instrumentId }
      : null,
    after: {
      key: input.key,
      phase,
      value: input.value,
      verdict: judged.verdict,
      instrumentId: instrument?.id ?? null,
      ...(instrumentOverdue ? { instrumentOverdue } : {}),
    },
  });
  return {
    key: input.key,
    phase,
    value: input.value,
    verdict: judged.verdict,
    toleranceText: judged.toleranceText,
    deviation: judged.deviation ?? null,
    allowed: judged.allowed ?? null,
    recordedAt: now.toISOString(),
    instrumentId: instrument?.id ?? null,
    instrumentOverdue,
  };
}

/** Ticks (or unticks) a checklist line, keeping who and when. */
export async function setTask(
  ctx: TxContext,
  { jobId, actorId, code, done }: { jobId: string; actorId: string; code: string; done: boolean },
) {
  const { job } = await loadJob(ctx.tx, jobId, { lock: true });
  requireState(job, READING_STATES, "tick checklist lines");
  const [task] = await ctx.tx
    .select()
    .from(jobTasks)
    .where(and(eq(jobTasks.jobId, jobId), eq(jobTasks.code, code)))
    .limit(1);
  if (!task) throw new AppError("not_found", "That checklist line is not on this job.");
  const now = new Date();
  await ctx.tx
    .update(jobTasks)
    .set(done ? { doneBy: actorId, doneAt: now } : { doneBy: null, doneAt: null })
    .where(eq(jobTasks.id, task.id));
  await audit(ctx, {
    actorId,
    action: done ? "task.done" : "task.reopen",
    entity: "job",
    entityId: jobId,
    before: { code, done: Boolean(task.doneAt) },
    after: { code, done },
  });
  return { code, done, doneAt: done ? now.toISOString() : null };
}

/** A workshop-only note; the same key again returns the first note instead of adding another. */
export async function addBenchNote(
  ctx: TxContext,
  { jobId, actorId, body, idempotencyKey }: { jobId: string; actorId: string; body: string; idempotencyKey: string },
) {
  await loadJob(ctx.tx, jobId, { lock: true });
  const existing = await findKeyedMessage(ctx, { jobId, authorId: actorId, idempotencyKey, body, internal: true, isQuestion: false });
  if (existing) return { messageId: existing.id, duplicate: true };
  const [msg] = await ctx.tx
    .insert(messages)
    .values({ jobId, authorId: actorId, body, internal: true, idempotencyKey })
    .returning({ id: messages.id });
  return { messageId: msg!.id, duplicate: false };
}

// ---- Completion and return -----------------------------------------------------------------------------

export type CompletionReason = { kind: "reading-missing" | "reading-failing" | "line-open" | "profile"; key: string; text: string };

/** Why the job cannot be completed yet; an empty list means it can. */
export async function completionGate(tx: Database, jobId: string) {
  const { set } = await loadJob(tx, jobId);
  const basis = await sheetBasis(tx, jobId, set);
  const reasons: CompletionReason[] = [];
  if (!basis.profile)
    reasons.push({ kind: "profile", key: "profile", text: "The set profile is incomplete, so the required readings are unknown." });
  // The set is judged as it goes back: the as-returned readings.
  const stored = await tx
    .select()
    .from(readings)
    .where(and(eq(readings.jobId, jobId), eq(readings.phase, "as_returned")));
  const values = Object.fromEntries(stored.map((r) => [r.key, r.value]));
  const sheet = judgeReadings(basis.requirements, values);
  for (const r of sheet.results) {
    if (r.verdict === "missing") reasons.push({ kind: "reading-missing", key: r.key, text: `${r.label}: not recorded yet.` });
    if (r.verdict === "fail")
      reasons.push({
        kind: "reading-failing",
        key: r.key,
        text: `${r.label}: ${r.value} ${r.unit} is outside the tolerance (${r.toleranceText}).`,
      });
  }
  const tasks = await tx.select().from(jobTasks).where(eq(jobTasks.jobId, jobId));
  for (const t of tasks) if (!t.doneAt) reasons.push({ kind: "line-open", key: t.code, text: `Checklist line not ticked: ${t.title}.` });
  return { reasons, sheet, tasks };
}

function refuse(message: string, reasons: CompletionReason[]): AppError {
  return new AppError(
    "conflict",
    message,
    Object.fromEntries(reasons.map((r) => [r.kind === "line-open" ? `task:${r.key}` : r.key, r.text])),
  );
}

/** All lines ticked: the set goes to final checks. */
export async function beginFinalChecks(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  const { job } = await loadJob(ctx.tx, jobId, { lock: true });
  requireState(job, ["on_bench"], "start final checks");
  const { reasons } = await completionGate(ctx.tx, jobId);
  const open = reasons.filter((r) => r.kind === "line-open");
  if (open.length) throw refuse(`Final checks start once every checklist line is ticked; ${open.length} still open.`, open);
  return transitionJob(ctx, { jobId, to: "final_checks", actor: "staff", actorId, note: "All checklist lines ticked" });
}

export async function returnToBench(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  return transitionJob(ctx, { jobId, to: "on_bench", actor: "staff", actorId, note: "Back to the bench from final checks" });
}

/**
 * Completion: refused with every reason while a required reading is missing or failing or a line is
 * open; otherwise the job moves to "balance due" and the owner is asked for the balance.
 */
export async function completeJob(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string }) {
  const { job, set, customer } = await loadJob(ctx.tx, jobId, { lock: true });
  requireState(job, ["final_checks"], "complete the job");
  const { reasons } = await completionGate(ctx.tx, jobId);
  if (reasons.length) {
    throw refuse(
      `The job cannot be completed yet: ${reasons.length} ${reasons.length === 1 ? "thing needs" : "things need"} attention.`,
      reasons,
    );
  }
  const approved = await getApprovedRevisionWithLines({ jobId }, ctx.tx);
  if (!approved) throw new AppError("conflict", "No approved estimate was found for this job.");
  const exponent = typeof approved.revision.pricing.exponent === "number" ? approved.revision.pricing.exponent : 2;
  await transitionJob(ctx, {
    jobId,
    to: "balance_due",
    actor: "staff",
    actorId,
    note: "Completed: every required reading passes",
    patch: { completedAt: new Date() },
  });
  // Warranty work and jobs already paid for have nothing to collect: they move on by themselves.
  const { account, movedOn, waivedMinor } = await settleIfNothingOwed(ctx, jobId, { actorId });
  const currency = approved.revision.currency;
  await queueEmail(ctx, {
    to: customer.email,
    template: "balance-due",
    props: {
      name: customer.name,
      jobNumber: jobNumber(job.number),
      setName: setName(set),
      url: portalUrl(jobId),
      balanceText: moneyText(account.owedMinor, currency, exponent),
      ...(movedOn ? { settled: true } : {}),
      ...(account.owedBackMinor > 0 ? { owedBackText: moneyText(account.owedBackMinor, currency, exponent) } : {}),
      ...(waivedMinor > 0 ? { waivedText: moneyText(waivedMinor, currency, exponent) } : {}),
    },
    dedupeKey: `balance-due:${jobId}:r${approved.revision.revision}`,
  });
  return {
    balanceMinor: account.owedMinor,
    owedBackMinor: account.owedBackMinor,
    waivedMinor,
    movedOn,
    currency: approved.revision.currency,
    exponent,
  };
}

/** The set goes back to its owner (paid in full): the return is recorded and the certificate issued together. */
export async function recordReturn(ctx: TxContext, { jobId, actorId, input }: { jobId: string; actorId: string; input: ReturnInput }) {
  const { job, set, customer } = await loadJob(ctx.tx, jobId);
  requireState(job, ["paid_in_full"], "record the return");
  const shipped = input.method === "shipped" ? input : null;
  // A set shipped without a chosen return address goes to the owner's default: the job keeps that copy.
  if (shipped) await snapshotDefaultReturnAddress(ctx, { jobId });
  await transitionJob(ctx, {
    jobId,
    to: "returned",
    actor: "staff",
    actorId,
    note: shipped ? `Shipped by ${shipped.carrier}, tracking ${shipped.trackingNumber}` : "Picked up at the shop",
    patch: {
      returnMethod: input.method,
      carrier: shipped?.carrier ?? null,
      trackingNumber: shipped?.trackingNumber ?? null,
      returnedAt: new Date(),
    },
  });
  const certificate = await issueCertificate(ctx, { jobId, actorId });
  await queueEmail(ctx, {
    to: customer.email,
    template: "set-returned",
    props: {
      name: customer.name,
      jobNumber: jobNumber(job.number),
      setName: setName(set),
      method: input.method,
      ...(shipped ? { carrier: shipped.carrier, trackingNumber: shipped.trackingNumber } : {}),
      url: portalUrl(jobId),
    },
    dedupeKey: `set-returned:${jobId}`,
  });
  return { certificateId: certificate.certificateId, code: certificate.code };
}

// ---- Read side -----------------------------------------------------------------------------------------

/**
 * Everything the bench sheet shows: required readings with stored values and verdicts in both phases (the
 * flat value and verdict are the as-returned ones), the instruments on offer with the viewer's last choice
 * per kind, lines, the gate.
 */
export async function getBenchSheet({ jobId, viewerId }: { jobId: string; viewerId?: string }) {
  const { job, set } = await loadJob(db, jobId);
  const basis = await sheetBasis(db, jobId, set);
  const stored = await db
    .select({
      key: readings.key,
      phase: readings.phase,
      value: readings.value,
      note: readings.note,
      verdict: readings.verdict,
      recordedAt: readings.recordedAt,
      recordedByName: user.name,
      instrumentId: readings.instrumentId,
      instrumentOverdue: readings.instrumentOverdue,
    })
    .from(readings)
    .leftJoin(user, eq(user.id, readings.recordedBy))
    .where(eq(readings.jobId, jobId));
  const byKey = new Map(stored.filter((r) => r.phase === "as_returned").map((r) => [r.key, r]));
  const receivedByKey = new Map(stored.filter((r) => r.phase === "as_received").map((r) => [r.key, r]));
  const offered = await listOfferedInstruments();
  // Instruments retired since a reading named them are still shown by name on that reading.
  const named = [...new Set(stored.map((r) => r.instrumentId).filter((id): id is string => id !== null))].filter(
    (id) => !offered.some((o) => o.id === id),
  );
  const retired = named.length
    ? (await db.select().from(instruments).where(inArray(instruments.id, named))).map((r) => ({
        id: r.id,
        label: `${r.maker} ${r.model} (${r.serial})`,
        calibrationDueOn: r.calibrationDueOn,
      }))
    : [];
  const lastChoices = viewerId ? await lastInstrumentChoices({ userId: viewerId }) : {};
  const tasks = await db
    .select({ code: jobTasks.code, title: jobTasks.title, doneAt: jobTasks.doneAt, doneByName: user.name })
    .from(jobTasks)
    .leftJoin(user, eq(user.id, jobTasks.doneBy))
    .where(eq(jobTasks.jobId, jobId));
  const order = new Map(basis.lines.map((l, i) => [l.code, i]));
  tasks.sort((a, b) => (order.get(a.code) ?? 999) - (order.get(b.code) ?? 999));
  const gate = await completionGate(db, jobId);
  const perf = await performanceRequirementsFor(db, jobId, basis.profile);
  return {
    jobState: job.state,
    editable: READING_STATES.includes(job.state),
    profile: basis.profile,
    requirements: basis.requirements.map((r) => {
      const s = byKey.get(r.key);
      return {
        ...r,
        value: s?.value ?? null,
        note: s?.note ?? null,
        verdict: judgeReading(r, s?.value ?? null).verdict,
        recordedAt: s?.recordedAt.toISOString() ?? null,
        recordedByName: s?.recordedByName ?? null,
        instrumentId: s?.instrumentId ?? null,
        instrumentOverdue: s?.instrumentOverdue ?? false,
        instrumentKinds: [...instrumentKindsFor(r)],
        asReceived: received(r, receivedByKey.get(r.key)),
      };
    }),
    tasks: tasks.map((t) => ({ ...t, doneAt: t.doneAt?.toISOString() ?? null })),
    reasons: gate.reasons,
    performance: {
      enabled: perf.setup.enabled,
      conditions: perf.setup.conditions,
      requirements: perf.requirements.map((r) => {
        const s = byKey.get(r.key);
        return {
          ...r,
          value: s?.value ?? null,
          verdict: judgeReading(r, s?.value ?? null).verdict,
          recordedAt: s?.recordedAt.toISOString() ?? null,
          recordedByName: s?.recordedByName ?? null,
        };
      }),
      strips: basis.profile ? sweepStrips(basis.profile) : [],
      sweeps: perf.setup.enabled ? sweepViews(await loadSweeps(db, jobId)) : [],
    },
    defaultPhase: defaultReadingPhase({ state: job.state, linesTicked: tasks.filter((t) => t.doneAt !== null).length }),
    instruments: offered,
    retiredInstruments: retired,
    lastChoices,
  };
}

type StoredReading = {
  value: number | null;
  note: string | null;
  recordedAt: Date;
  recordedByName: string | null;
  instrumentId: string | null;
  instrumentOverdue: boolean;
};

function received(r: ReadingRequirement, s: StoredReading | undefined) {
  if (!s) return null;
  return {
    value: s.value,
    note: s.note,
    verdict: judgeReading(r, s.value).verdict,
    recordedAt: s.recordedAt.toISOString(),
    recordedByName: s.recordedByName,
    instrumentId: s.instrumentId,
    instrumentOverdue: s.instrumentOverdue,
  };
}

export type BenchSheet = Awaited<ReturnType<typeof getBenchSheet>>;

type OwnerDialEnds = { band: string; low: number | null; high: number | null };

/** What the owner reported with the request (dial markings as they read them), read defensively from the profile. */
function ownerReportOf(profile: unknown): { dialMarkings: string; dialEnds: OwnerDialEnds[] } {
  const report = ((profile ?? {}) as { ownerReport?: unknown }).ownerReport as { dialMarkings?: unknown; dialEnds?: unknown } | undefined;
  const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
  const ends = report?.dialEnds && typeof report.dialEnds === "object" ? (report.dialEnds as Record<string, unknown>) : {};
  return {
    dialMarkings: typeof report?.dialMarkings === "string" ? report.dialMarkings : "",
    dialEnds: ["LW", "MW", "SW", "FM"]
      .filter((b) => ends[b] && typeof ends[b] === "object")
      .map((b) => {
        const e = ends[b] as { low?: unknown; high?: unknown };
        return { band: b, low: num(e.low), high: num(e.high) };
      }),
  };
}

/** The job page's header, triage data, messages, photos and history. */
export async function getJobDetail({ jobId }: { jobId: string }) {
  const row = await getJobDetailForStaff({ jobId });
  if (!row) throw new AppError("not_found", "That job was not found.");
  const [messageRows, photoRows, history, staff, decisions, shipTo] = await Promise.all([
    listMessagesForStaff({ jobId }),
    listPhotosForStaff({ jobId }),
    listHistoryForStaff({ jobId }),
    listAssignableStaff(),
    listRevisionDecisionsForStaff({ jobId }),
    jobShipToLines({ jobId }),
  ]);
  const profile = checkProfile(row.set.profile);
  const { idempotencyKey: _key, ...job } = row.job;
  return {
    job: { ...job, jobNumber: jobNumber(row.job.number) },
    set: row.set,
    profileIssues: profile.ok ? null : profile.fields,
    // A phone-only contact's stored placeholder address is never shown.
    customer: { ...row.customer, email: shownEmail(row.customer.email) },
    technicianName: row.technicianName,
    decisions,
    messages: messageRows,
    // Served by the authorised photo route (the session cookie goes with the image request).
    photos: photoRows.map((p) => ({ ...p, url: `/api/photos/${p.id}`, thumbUrl: `/api/photos/${p.id}?size=thumb` })),
    ownerReport: ownerReportOf(row.set.profile),
    history,
    staff,
    // Where the set is shipped back: the owner's choice for this job, else their default address for now.
    shipTo,
  };
}

export type JobDetail = Awaited<ReturnType<typeof getJobDetail>>;
