import "server-only";
import { and, asc, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { jobPerformance, jobs, passbandSweeps, radioSets } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import type { SetProfile } from "@/lib/engine/checklist/profile";
import { distinctIfs } from "@/lib/engine/checklist/profile";
import { buildPassbandSection, type StoredSweep } from "@/lib/engine/certificates/performance-section";
import { isEngineError } from "@/lib/engine/engine-error";
import { STATE_LABEL, type JobState } from "@/lib/engine/jobs/states";
import {
  analyseDiscriminator,
  analysePassband,
  type DiscriminatorPoint,
  type DiscriminatorResult,
  type PassbandPoint,
  type PassbandResult,
} from "@/lib/engine/passband";
import {
  defaultPerformanceSetup,
  listPerformanceReadings,
  performanceConditionsSchema,
  type PerformanceRequirement,
  type PerformanceSetup,
} from "@/lib/engine/performance";
import { readingValueProblem } from "@/lib/engine/verdicts";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { checkProfile } from "@/lib/server/services/estimates";
import type { PassbandSweepInput, PerformanceUpdate } from "@/lib/validation/performance";

// Performance readings and IF sweeps are taken while the set is on the bench, as the other readings are.
const PERFORMANCE_STATES: readonly JobState[] = ["on_bench", "bench_revision", "final_checks"];

/** The job's setup; a job never opted in has the default (off, usual conditions, no figures). */
export async function loadPerformanceSetup(tx: Database, jobId: string): Promise<PerformanceSetup> {
  const [row] = await tx.select().from(jobPerformance).where(eq(jobPerformance.jobId, jobId)).limit(1);
  if (!row) return defaultPerformanceSetup;
  const conditions = performanceConditionsSchema.safeParse(row.conditions);
  const figures = Object.fromEntries(Object.entries(row.figures ?? {}).filter(([, v]) => typeof v === "number" && Number.isFinite(v)));
  return { enabled: row.enabled, conditions: conditions.success ? conditions.data : defaultPerformanceSetup.conditions, figures };
}

/** The performance readings this job offers: none unless the technician opted in. */
export async function performanceRequirementsFor(
  tx: Database,
  jobId: string,
  profile: SetProfile | null,
): Promise<{ setup: PerformanceSetup; requirements: PerformanceRequirement[] }> {
  const setup = await loadPerformanceSetup(tx, jobId);
  return { setup, requirements: profile ? listPerformanceReadings(profile, setup) : [] };
}

async function lockJob(tx: Database, jobId: string) {
  const [row] = await tx
    .select({ job: jobs, set: radioSets })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.id, jobId))
    .for("update", { of: jobs })
    .limit(1);
  if (!row) throw new AppError("not_found", "That job was not found.");
  if (!PERFORMANCE_STATES.includes(row.job.state)) {
    throw new AppError(
      "invalid_transition",
      `You cannot record performance readings while the job is "${STATE_LABEL[row.job.state].staff}".`,
    );
  }
  const profile = checkProfile(row.set.profile);
  if (!profile.ok) throw new AppError("conflict", "The set profile is incomplete: finish it in Triage first.");
  return { job: row.job, profile: profile.profile };
}

/** Opts the job in or out, sets the conditions and enters or takes away service figures. */
export async function updatePerformance(
  ctx: TxContext,
  { jobId, actorId, input }: { jobId: string; actorId: string; input: PerformanceUpdate },
) {
  const { profile } = await lockJob(ctx.tx, jobId);
  const before = await loadPerformanceSetup(ctx.tx, jobId);
  const conditions = input.conditions ?? before.conditions;
  // Figures are checked against every reading this set kind offers, whatever the opt-in says now.
  const offered = new Map(listPerformanceReadings(profile, { enabled: true, conditions, figures: {} }).map((r) => [r.key, r]));
  const figures = { ...before.figures };
  const fields: Record<string, string> = {};
  for (const [key, value] of Object.entries(input.figures ?? {})) {
    const r = offered.get(key);
    if (!r) {
      fields[`figures.${key}`] = "This set does not offer that performance reading.";
      continue;
    }
    if (value === null) {
      delete figures[key];
      continue;
    }
    const problem = readingValueProblem(r, value);
    if (problem) fields[`figures.${key}`] = `Service figure: ${problem}`;
    else figures[key] = value;
  }
  if (Object.keys(fields).length) throw new AppError("invalid_input", Object.values(fields)[0]!, fields);
  const values = {
    enabled: input.enabled,
    conditions: conditions as Record<string, unknown>,
    figures,
    updatedBy: actorId,
    updatedAt: new Date(),
  };
  await ctx.tx
    .insert(jobPerformance)
    .values({ jobId, ...values })
    .onConflictDoUpdate({ target: jobPerformance.jobId, set: values });
  await audit(ctx, {
    actorId,
    action: "performance.setup",
    entity: "job",
    entityId: jobId,
    before: { enabled: before.enabled, figures: before.figures },
    after: { enabled: input.enabled, figures },
  });
  return { enabled: input.enabled, conditions, figures };
}

export type SweepView =
  | { curve: "response"; ifKHz: number; method: "sweep" | "generator"; points: PassbandPoint[]; result: PassbandResult; recordedAt: string }
  | {
      curve: "discriminator";
      ifKHz: number;
      method: "sweep" | "generator";
      points: DiscriminatorPoint[];
      linearityPercent?: number;
      result: DiscriminatorResult;
      recordedAt: string;
    };

/** The IF strips a set can be swept on: every distinct IF, and the discriminator on an FM strip. */
export function sweepStrips(profile: SetProfile): { ifKHz: number; curves: ("response" | "discriminator")[] }[] {
  return distinctIfs(profile.bands).map(({ ifKHz, kind }) => ({
    ifKHz,
    curves: kind === "FM" ? ["response", "discriminator"] : ["response"],
  }));
}

/** Stores one strip's sweep (replacing the last), after the engine has read it; no points takes it away. */
export async function savePassbandSweep(
  ctx: TxContext,
  { jobId, actorId, input }: { jobId: string; actorId: string; input: PassbandSweepInput },
) {
  const { profile } = await lockJob(ctx.tx, jobId);
  const setup = await loadPerformanceSetup(ctx.tx, jobId);
  if (!setup.enabled) {
    throw new AppError("conflict", "Turn on performance readings for this job before recording an IF sweep.", {
      enabled: "Performance readings are off for this job.",
    });
  }
  const strip = sweepStrips(profile).find((s) => s.ifKHz === input.ifKHz);
  if (!strip) {
    const known = sweepStrips(profile)
      .map((s) => `${s.ifKHz} kHz`)
      .join(", ");
    throw new AppError("invalid_input", `This set has no IF of ${input.ifKHz} kHz (its IFs: ${known}).`, { ifKHz: `One of ${known}.` });
  }
  if (!strip.curves.includes(input.curve)) {
    throw new AppError("invalid_input", "A discriminator curve is swept on an FM strip only.", { curve: "Only on an FM strip." });
  }
  const where = and(eq(passbandSweeps.jobId, jobId), eq(passbandSweeps.ifKHz, input.ifKHz), eq(passbandSweeps.curve, input.curve));
  if (input.points.length === 0) {
    await ctx.tx.delete(passbandSweeps).where(where);
    await audit(ctx, {
      actorId,
      action: "passband.clear",
      entity: "job",
      entityId: jobId,
      after: { ifKHz: input.ifKHz, curve: input.curve },
    });
    return { ifKHz: input.ifKHz, curve: input.curve, cleared: true as const };
  }
  let result: PassbandResult | DiscriminatorResult;
  try {
    result = input.curve === "response" ? analysePassband(input.points) : analyseDiscriminator(input.points, input.linearityPercent);
  } catch (e) {
    if (isEngineError(e)) throw new AppError("invalid_input", e.message, { [e.field ?? "points"]: e.message });
    throw e;
  }
  const points =
    input.curve === "response"
      ? [...input.points].sort((a, b) => a.offsetKHz - b.offsetKHz).map((p) => ({ offsetKHz: p.offsetKHz, db: p.db }))
      : [...input.points].sort((a, b) => a.offsetKHz - b.offsetKHz).map((p) => ({ offsetKHz: p.offsetKHz, volts: p.volts }));
  const values = {
    method: input.method,
    points: points as Record<string, number>[],
    linearityPercent: input.curve === "discriminator" ? (input.linearityPercent ?? null) : null,
    recordedBy: actorId,
    recordedAt: new Date(),
  };
  await ctx.tx
    .insert(passbandSweeps)
    .values({ jobId, ifKHz: input.ifKHz, curve: input.curve, ...values })
    .onConflictDoUpdate({ target: [passbandSweeps.jobId, passbandSweeps.ifKHz, passbandSweeps.curve], set: values });
  await audit(ctx, {
    actorId,
    action: "passband.record",
    entity: "job",
    entityId: jobId,
    after: { ifKHz: input.ifKHz, curve: input.curve, method: input.method, points: points.length },
  });
  return { ifKHz: input.ifKHz, curve: input.curve, cleared: false as const, result };
}

/** The stored sweeps as the engine reads them. */
export async function loadSweeps(tx: Database, jobId: string): Promise<(StoredSweep & { recordedAt: Date })[]> {
  const rows = await tx
    .select()
    .from(passbandSweeps)
    .where(eq(passbandSweeps.jobId, jobId))
    .orderBy(asc(passbandSweeps.ifKHz), asc(passbandSweeps.curve));
  return rows.map((r) => {
    if (r.curve === "response") {
      return {
        curve: "response" as const,
        ifKHz: r.ifKHz,
        method: r.method,
        points: r.points.map((p) => ({ offsetKHz: Number(p.offsetKHz), db: Number(p.db) })),
        recordedAt: r.recordedAt,
      };
    }
    return {
      curve: "discriminator" as const,
      ifKHz: r.ifKHz,
      method: r.method,
      points: r.points.map((p) => ({ offsetKHz: Number(p.offsetKHz), volts: Number(p.volts) })),
      ...(r.linearityPercent !== null ? { linearityPercent: r.linearityPercent } : {}),
      recordedAt: r.recordedAt,
    };
  });
}

export function sweepViews(sweeps: readonly (StoredSweep & { recordedAt: Date })[]): SweepView[] {
  return sweeps.map((s) =>
    s.curve === "response"
      ? { ...s, result: analysePassband(s.points), recordedAt: s.recordedAt.toISOString() }
      : { ...s, result: analyseDiscriminator(s.points, s.linearityPercent), recordedAt: s.recordedAt.toISOString() },
  );
}

/** For the certificate: the passband section of the job's stored sweeps, when any. */
export async function passbandSectionFor(tx: Database, jobId: string) {
  return buildPassbandSection(await loadSweeps(tx, jobId));
}
