import { and, eq, sql } from "drizzle-orm";
import { estimates, jobs } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { setProfileSchema, type SetProfileInput } from "@/lib/engine/checklist/profile";
import { beginFinalChecks, completeJob, recordReturn, startBenchWork, updateProfile } from "@/lib/server/services/bench";
import { buildDraft, saveDraft, sendRevision } from "@/lib/server/services/estimates";
import { checklistCatalogue } from "@/lib/server/services/parts";
import { recordOwnerDecision, takeInJob } from "@/lib/server/services/intake";
import { getShop } from "@/lib/server/services/shop";
import { intakeSchema } from "@/lib/validation/intake";
import { seedDemoInstruments } from "./instruments";
import { backdate, passAllReadings, recordAsReceived, recordDemoPayment } from "./jobs";

const PRIYA = "demo-tech-priya";
const ODILE = "demo-owner-odile";
// Fixed, so a second seed finds the job instead of taking the set in twice.
const COUNTER_KEY = "4b1d7c2e-8f3a-4c61-9e2d-5a7b3c9d1e0f";

const HALDANE_CORONET: SetProfileInput = {
  kind: "tube-transformer",
  bands: [
    { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455, label: "Broadcast" },
    { kind: "SW", lowKHz: 5900, highKHz: 18000, ifKHz: 455, label: "Overseas" },
  ],
  electrolytics: 3,
  paperCapacitors: 14,
  tubes: 6,
  ifTransformers: 2,
  lineCordWorn: true,
  mainsVolts: 120,
  bPlusVolts: 230,
  symptoms: ["hum", "no-sound"],
};

/**
 * A walk-in: Hollis Quade brings a Haldane table set to the counter and leaves a phone number only (a contact
 * without sign-in). The office takes it in, the technician corrects the profile and sends the estimate, the
 * owner approves it in person (recorded by the office), and the job runs through the bench to its return at
 * the counter with a signed certificate. The deposit is paid in cash and the balance by cheque at the counter,
 * each with its receipt, and the job's invoice is issued when it is paid in full.
 */
export async function seedCounterJob(ctx: TxContext): Promise<number> {
  const [existing] = await ctx.tx
    .select({ id: jobs.id })
    .from(jobs)
    .where(and(eq(jobs.idempotencyKey, COUNTER_KEY), eq(jobs.channel, "counter")))
    .limit(1);
  if (existing) return 0;
  const { byKind } = await seedDemoInstruments(ctx);
  const input = intakeSchema.parse({
    customerMode: "new",
    customerName: "Hollis Quade",
    customerPhone: "+1 555 0187",
    access: "contact",
    maker: "Haldane",
    model: "Coronet 6",
    year: 1949,
    kind: "tube-transformer",
    bands: ["MW", "SW"],
    dialEnds: { MW: { low: 55, high: 160 } },
    symptoms: "Loud hum from switch-on, no stations; smelled hot the last time it was plugged in.",
    priorWork: "None known; it came from the customer's uncle's attic.",
    poweredRecently: "briefly",
    channel: "counter",
    setAtShop: true,
    contactPreference: "phone",
    cautionsGiven: true,
    photos: [],
    idempotencyKey: COUNTER_KEY,
  });
  const { jobId } = await takeInJob(ctx, { input, actor: { id: ODILE, name: "Odile Marchetti" }, tickets: [] });
  const profile = setProfileSchema.parse(HALDANE_CORONET);
  await updateProfile(ctx, { jobId, actorId: PRIYA, input: { maker: "Haldane", model: "Coronet 6", year: 1949, profile } });
  const shop = await getShop(ctx.tx);
  const [est] = await ctx.tx.select({ version: estimates.version }).from(estimates).where(eq(estimates.jobId, jobId)).limit(1);
  await saveDraft(ctx, {
    jobId,
    actorId: PRIYA,
    version: est?.version ?? 0,
    lines: buildDraft(profile, shop.policy, await checklistCatalogue(ctx.tx)),
  });
  const { revisionId } = await sendRevision(ctx, { jobId, actorId: PRIYA });
  await recordOwnerDecision(ctx, {
    jobId,
    staffId: ODILE,
    input: {
      revisionId,
      decision: "approve",
      medium: "in-person",
      note: "Mr Quade read the estimate at the counter and agreed to the full restoration.",
    },
  });
  const job = { id: jobId, key: "demo-counter" };
  await recordDemoPayment(ctx, job, "deposit", "deposit_paid", { method: "cash", takenBy: ODILE });
  await startBenchWork(ctx, { jobId, actorId: PRIYA });
  await recordAsReceived(ctx, jobId, PRIYA, byKind);
  await passAllReadings(ctx, jobId, PRIYA, byKind);
  await beginFinalChecks(ctx, { jobId, actorId: PRIYA });
  await completeJob(ctx, { jobId, actorId: PRIYA });
  await recordDemoPayment(ctx, job, "balance", "paid_in_full", { method: "cheque", chequeNumber: "000318", takenBy: ODILE });
  await recordReturn(ctx, { jobId, actorId: ODILE, input: { method: "pick-up" } });
  await backdate(ctx, jobId, 18);
  // Handed over at the counter: the set was at the shop from the first day.
  await ctx.tx.execute(sql`update job set received_at = created_at where id = ${jobId}`);
  return 1;
}
