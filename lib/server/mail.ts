import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { Resend } from "resend";
import { db } from "@/db";
import { auditEvents, emailOutbox } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { isTemplateName, renderEmail, type TemplateName, type TemplateProps } from "@/emails";
import { isReachableEmail } from "@/lib/engine/contacts";
import { env } from "./env";
import { getBoss, QUEUES } from "./queue";

const MAIL_RETRY_LIMIT_OPTION = 8;
const DELIVERY_OPTIONS = { retryLimit: MAIL_RETRY_LIMIT_OPTION, retryDelay: 5, retryBackoff: true, expireInSeconds: 120 } as const;

type QueueArgs<T extends TemplateName> = { to: string; template: T; props: TemplateProps<T>; dedupeKey: string };

// Writes the message to the outbox and queues its delivery in the caller's transaction:
// either both happen with the change that caused them, or neither does.
export async function queueEmail<T extends TemplateName>(ctx: TxContext, args: QueueArgs<T>): Promise<void> {
  // A phone-only contact has no address to write to; the shop reaches them by phone.
  if (!isReachableEmail(args.to)) return;
  const [row] = await ctx.tx
    .insert(emailOutbox)
    .values({ dedupeKey: args.dedupeKey, toAddress: args.to, template: args.template, props: args.props as Record<string, unknown> })
    .onConflictDoNothing({ target: emailOutbox.dedupeKey })
    .returning({ id: emailOutbox.id });
  if (!row) return; // already queued by an earlier attempt
  const boss = await getBoss();
  await boss.send(QUEUES.email, { outboxId: row.id }, { db: ctx.raw, ...DELIVERY_OPTIONS });
}

export async function queueEmailNow<T extends TemplateName>(args: QueueArgs<T>): Promise<void> {
  await transaction((ctx) => queueEmail(ctx, args));
}

let resendClient: Resend | undefined;
function resend(): Resend {
  resendClient ??= new Resend(env().RESEND_API_KEY);
  return resendClient;
}

/** Deliveries per message before it is marked failed: the first try and the queue's retries. */
export const MAIL_RETRY_LIMIT = MAIL_RETRY_LIMIT_OPTION;

// Refusals that no retry can change: the message itself is wrong (an address the provider rejects, a bad field).
const PERMANENT = new Set([
  "validation_error",
  "missing_required_field",
  "invalid_from_address",
  "invalid_parameter",
  "invalid_attachment",
]);

export type DeliveryOutcome = "sent" | "retry" | "failed" | "skipped";

async function markFailed(id: string, attempts: number, reason: string) {
  await db
    .update(emailOutbox)
    .set({ status: "failed", attempts, lastError: reason.slice(0, 500) })
    .where(and(eq(emailOutbox.id, id), eq(emailOutbox.status, "queued")));
}

/**
 * Delivers one outbox message; the outbox id is the provider idempotency key, so a retry never sends twice.
 * Never throws for the message's own trouble: it answers "retry" (the queue tries again later), or "failed"
 * (refused for good, or the last retry is spent) with the reason kept on the row for the office.
 */
export async function deliverOutboxEmail(outboxId: string, { lastTry = false }: { lastTry?: boolean } = {}): Promise<DeliveryOutcome> {
  const row = await db.query.emailOutbox.findFirst({ where: eq(emailOutbox.id, outboxId) });
  if (!row || row.status !== "queued") return "skipped";
  const attempts = row.attempts + 1;
  if (!isTemplateName(row.template)) {
    await markFailed(row.id, attempts, "unknown template");
    return "failed";
  }
  let error: { name: string; message: string } | null = null;
  let providerId: string | null = null;
  try {
    const { subject, html, text } = await renderEmail(row.template, row.props);
    const result = await resend().emails.send(
      { from: env().MAIL_FROM, to: [row.toAddress], subject, html, text, tags: [{ name: "template", value: row.template }] },
      { idempotencyKey: `outbox-${row.id}` },
    );
    if (result.error) error = { name: result.error.name, message: result.error.message };
    else providerId = result.data?.id ?? null;
  } catch (e) {
    error = { name: "no_answer", message: e instanceof Error ? e.message : String(e) };
  }
  if (error) {
    const reason = `${error.name}: ${error.message}`;
    if (PERMANENT.has(error.name) || lastTry) {
      await markFailed(
        row.id,
        attempts,
        PERMANENT.has(error.name) ? `Refused by the mail provider — ${reason}` : `Gave up after ${attempts} tries — ${reason}`,
      );
      return "failed";
    }
    await db
      .update(emailOutbox)
      .set({ attempts, lastError: reason.slice(0, 500) })
      .where(eq(emailOutbox.id, row.id));
    return "retry";
  }
  await db
    .update(emailOutbox)
    .set({ status: "sent", sentAt: new Date(), attempts, providerId, lastError: null })
    .where(eq(emailOutbox.id, row.id));
  return "sent";
}

export async function startEmailWorker(): Promise<void> {
  const boss = await getBoss();
  await boss.work<{ outboxId: string }>(
    QUEUES.email,
    { batchSize: 5, pollingIntervalSeconds: 0.5, includeMetadata: true },
    async (jobs) => {
      // Each message stands alone: one that must be tried again is failed back to the queue by itself, and
      // the rest of the batch completes (a throw here would send the whole batch round again).
      const again: string[] = [];
      for (const job of jobs) {
        const lastTry = job.retryCount >= job.retryLimit;
        let outcome: DeliveryOutcome;
        try {
          outcome = await deliverOutboxEmail(job.data.outboxId, { lastTry });
        } catch (e) {
          console.error("[bandedge] e-mail delivery crashed; tried again later", job.data.outboxId, e);
          outcome = "retry";
        }
        if (outcome === "retry") again.push(job.id);
      }
      for (const id of again) await boss.fail(QUEUES.email, id, { message: "mail provider did not accept it; tried again later" });
    },
  );
}

/** Queues the delivery of an outbox row that is queued (again) outside a change's own transaction. */
export async function requeueOutboxEmail(outboxId: string): Promise<void> {
  const boss = await getBoss();
  await boss.send(QUEUES.email, { outboxId }, DELIVERY_OPTIONS);
}

/**
 * Rows a crash left behind: still queued, old enough that their delivery should have run, and with no live
 * job in the queue. Each is queued again, or marked failed when its tries are spent.
 */
export async function sweepStuckEmails({ olderThanSeconds = 300 }: { olderThanSeconds?: number } = {}): Promise<number> {
  const stuck = await db.execute<{ id: string; attempts: number; last_error: string | null }>(sql`
    select o.id, o.attempts, o.last_error from email_outbox o
    where o.status = 'queued'
      and coalesce(o.queued_at, o.created_at) < now() - make_interval(secs => ${olderThanSeconds})
      and not exists (
        select 1 from pgboss.job j
        where j.name = ${QUEUES.email} and j.data->>'outboxId' = o.id::text and j.state < 'completed'
      )
    order by o.created_at
    limit 100`);
  for (const row of stuck.rows) {
    if (row.attempts > MAIL_RETRY_LIMIT) {
      await markFailed(row.id, row.attempts, `Gave up after ${row.attempts} tries — ${row.last_error ?? "no answer"}`);
      continue;
    }
    await db.update(emailOutbox).set({ queuedAt: new Date() }).where(eq(emailOutbox.id, row.id));
    await requeueOutboxEmail(row.id);
  }
  return stuck.rows.length;
}

/** The office's "send again": a failed message goes back to the queue with fresh tries, audited. */
export async function resendFailedEmail(outboxId: string, actorId: string): Promise<boolean> {
  return transaction(async (ctx) => {
    const [row] = await ctx.tx
      .update(emailOutbox)
      .set({ status: "queued", attempts: 0, queuedAt: new Date() })
      .where(and(eq(emailOutbox.id, outboxId), eq(emailOutbox.status, "failed")))
      .returning({ id: emailOutbox.id, lastError: emailOutbox.lastError, template: emailOutbox.template });
    if (!row) return false;
    const boss = await getBoss();
    await boss.send(QUEUES.email, { outboxId: row.id }, { db: ctx.raw, ...DELIVERY_OPTIONS });
    await ctx.tx.insert(auditEvents).values({
      actorId,
      action: "email.resend",
      entity: "email_outbox",
      entityId: row.id,
      before: { status: "failed", lastError: row.lastError },
      after: { status: "queued", template: row.template },
    });
    return true;
  });
}
