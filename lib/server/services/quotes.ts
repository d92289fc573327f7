import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { jobs, photos, radioSets, user } from "@/db/schema";
import { transaction } from "@/db/transaction";
import { dialPresetsFor } from "@/lib/engine/bands/presets";
import type { Band } from "@/lib/engine/bands/band";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { jobNumber } from "@/lib/engine/jobs/states";
import { queueEmail } from "@/lib/server/mail";
import { notifyStaff } from "@/lib/server/services/notifications";
import { recordJobCreated } from "@/lib/server/services/jobs";
import { readTicket } from "@/lib/server/uploads/photos";
import type { QuoteRequest } from "@/lib/validation/quote";

type Viewer = { id: string; name: string; email: string };

// Default dial ranges per band the owner ticked; the technician corrects them (and the IF) at triage.
export function draftBands(kinds: QuoteRequest["bands"]): Band[] {
  const region2 = dialPresetsFor(2);
  const region1 = dialPresetsFor(1);
  const pick = (id: string, from = region2) => from.find((p) => p.id === id)?.band;
  const out: Band[] = [];
  for (const kind of kinds) {
    const band = kind === "LW" ? pick("lw", region1) : kind === "MW" ? pick("mw-older") : kind === "SW" ? pick("sw-49-31") : pick("fm");
    if (band) out.push({ ...band, ...(kind === "LW" ? { ifKHz: 455 } : {}) });
  }
  return out;
}

// The dial-scale ends the owner gave, for the bands they ticked, leaving out bands with neither end given.
export function dialEndsOf(
  input: Pick<QuoteRequest, "bands" | "dialEnds">,
): Partial<Record<QuoteRequest["bands"][number], { low: number | null; high: number | null }>> {
  const out: Partial<Record<QuoteRequest["bands"][number], { low: number | null; high: number | null }>> = {};
  for (const band of input.bands) {
    const ends = input.dialEnds[band];
    if (ends && (ends.low !== undefined || ends.high !== undefined)) out[band] = { low: ends.low ?? null, high: ends.high ?? null };
  }
  return out;
}

/**
 * The set row as its owner described it, online or at the counter: draft bands for the technician to correct,
 * and the owner's own report kept apart from the technician's corrected profile.
 */
export function newSetValues(
  ownerId: string,
  input: Pick<QuoteRequest, "maker" | "model" | "year" | "serial" | "kind" | "bands" | "dialMarkings" | "dialEnds" | "poweredRecently">,
) {
  return {
    ownerId,
    maker: input.maker,
    model: input.model,
    year: input.year ?? null,
    serial: input.serial || null,
    kind: input.kind,
    profile: {
      kind: input.kind,
      bands: draftBands(input.bands),
      electrolytics: 0,
      paperCapacitors: 0,
      ownerReport: {
        bands: input.bands,
        dialMarkings: input.dialMarkings,
        dialEnds: dialEndsOf(input),
        poweredRecently: input.poweredRecently,
      },
    },
  };
}

function isUniqueViolation(e: unknown): boolean {
  const code = (e as { code?: string }).code ?? (e as { cause?: { code?: string } }).cause?.code;
  return code === "23505";
}

/**
 * A quote request: the set, the job, its photos, the first history row and audit entry, and the
 * "quote received" e-mail, all in one transaction. The same idempotency key twice gives the same job.
 */
export async function submitQuote(viewer: Viewer, input: QuoteRequest): Promise<{ jobId: string; number: number; duplicate: boolean }> {
  const tickets = input.photos.map((t) => readTicket(t, viewer.id));
  const keys = new Set(tickets.map((t) => t.key));
  if (keys.size !== tickets.length) {
    throw new AppError("invalid_input", "The same photo was added twice.", { photos: "The same photo was added twice." });
  }
  const findExisting = async () => {
    const [row] = await db
      .select({ id: jobs.id, number: jobs.number })
      .from(jobs)
      .where(and(eq(jobs.customerId, viewer.id), eq(jobs.idempotencyKey, input.idempotencyKey)))
      .limit(1);
    return row;
  };
  const existing = await findExisting();
  if (existing) return { jobId: existing.id, number: existing.number, duplicate: true };

  try {
    return await transaction(async (ctx) => {
      const { tx } = ctx;
      const used = await tx
        .select({ id: photos.id })
        .from(photos)
        .where(inArray(photos.storageKey, [...keys]))
        .limit(1);
      if (used.length) {
        throw new AppError("invalid_input", "One of these photos is already attached to a request. Please add it again.", {
          photos: "One of these photos is already attached to a request. Please add it again.",
        });
      }
      const [set] = await tx.insert(radioSets).values(newSetValues(viewer.id, input)).returning({ id: radioSets.id });
      const now = new Date();
      const [job] = await tx
        .insert(jobs)
        .values({
          setId: set!.id,
          customerId: viewer.id,
          symptoms: input.symptoms,
          priorWork: input.priorWork,
          poweredRecently: input.poweredRecently,
          delivery: input.delivery,
          contactPreference: input.contactPreference,
          cautionsAcknowledgedAt: now,
          idempotencyKey: input.idempotencyKey,
        })
        .returning({ id: jobs.id, number: jobs.number });
      await tx.insert(photos).values(
        tickets.map((t) => ({
          uploaderId: viewer.id,
          jobId: job!.id,
          storageKey: t.key,
          thumbKey: t.thumbKey,
          displayName: t.name,
          mime: "image/jpeg",
          width: t.width,
          height: t.height,
          bytes: t.bytes,
        })),
      );
      if (input.contactPreference === "phone" && input.phone) {
        await tx.update(user).set({ phone: input.phone }).where(eq(user.id, viewer.id));
      }
      await recordJobCreated(ctx, { jobId: job!.id, actorId: viewer.id });
      await queueEmail(ctx, {
        to: viewer.email,
        template: "quote-received",
        props: {
          name: viewer.name,
          jobNumber: jobNumber(job!.number),
          setName: `${input.maker} ${input.model}`,
          url: `${env().APP_URL}/portal/jobs/${job!.id}`,
          delivery: input.delivery,
        },
        dedupeKey: `quote-received:${job!.id}`,
      });
      await notifyStaff(ctx, {
        kind: "quote_requested",
        jobId: job!.id,
        technicianId: null,
        actorId: viewer.id,
        title: `New quote request ${jobNumber(job!.number)}: ${input.maker} ${input.model}`,
        body: input.symptoms,
        dedupeKey: `quote:${job!.id}`,
      });
      return { jobId: job!.id, number: job!.number, duplicate: false };
    });
  } catch (error) {
    if (isUniqueViolation(error)) {
      const again = await findExisting();
      if (again) return { jobId: again.id, number: again.number, duplicate: true };
    }
    throw error;
  }
}
