import "server-only";
import { eq } from "drizzle-orm";
import { Resend } from "resend";
import { db } from "@/db";
import { emailOutbox } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { isTemplateName, renderEmail, type TemplateName, type TemplateProps } from "@/emails";
import { env } from "./env";
import { getBoss, QUEUES } from "./queue";

type QueueArgs<T extends TemplateName> = { to: string; template: T; props: TemplateProps<T>; dedupeKey: string };

// Writes the message to the outbox and queues its delivery in the caller's transaction:
// either both happen with the change that caused them, or neither does.
export async function queueEmail<T extends TemplateName>(ctx: TxContext, args: QueueArgs<T>): Promise<void> {
  const [row] = await ctx.tx
    .insert(emailOutbox)
    .values({ dedupeKey: args.dedupeKey, toAddress: args.to, template: args.template, props: args.props as Record<string, unknown> })
    .onConflictDoNothing({ target: emailOutbox.dedupeKey })
    .returning({ id: emailOutbox.id });
  if (!row) return; // already queued by an earlier attempt
  const boss = await getBoss();
  await boss.send(
    QUEUES.email,
    { outboxId: row.id },
    { db: ctx.raw, retryLimit: 8, retryDelay: 5, retryBackoff: true, expireInSeconds: 120 },
  );
}

export async function queueEmailNow<T extends TemplateName>(args: QueueArgs<T>): Promise<void> {
  await transaction((ctx) => queueEmail(ctx, args));
}

let resendClient: Resend | undefined;
function resend(): Resend {
  resendClient ??= new Resend(env().RESEND_API_KEY);
  return resendClient;
}

// Delivers one outbox message; the outbox id is the provider idempotency key, so a retry never sends twice.
export async function deliverOutboxEmail(outboxId: string): Promise<void> {
  const row = await db.query.emailOutbox.findFirst({ where: eq(emailOutbox.id, outboxId) });
  if (!row || row.status === "sent") return;
  if (!isTemplateName(row.template)) {
    await db.update(emailOutbox).set({ status: "failed", lastError: "unknown template" }).where(eq(emailOutbox.id, row.id));
    return;
  }
  const { subject, html, text } = await renderEmail(row.template, row.props);
  const result = await resend().emails.send(
    { from: env().MAIL_FROM, to: [row.toAddress], subject, html, text, tags: [{ name: "template", value: row.template }] },
    { idempotencyKey: `outbox-${row.id}` },
  );
  if (result.error) {
    await db
      .update(emailOutbox)
      .set({ attempts: row.attempts + 1, lastError: result.error.message })
      .where(eq(emailOutbox.id, row.id));
    throw new Error(`mail provider refused: ${result.error.message}`);
  }
  await db
    .update(emailOutbox)
    .set({ status: "sent", sentAt: new Date(), attempts: row.attempts + 1, providerId: result.data?.id ?? null, lastError: null })
    .where(eq(emailOutbox.id, row.id));
}

export async function startEmailWorker(): Promise<void> {
  const boss = await getBoss();
  await boss.work<{ outboxId: string }>(QUEUES.email, { batchSize: 5, pollingIntervalSeconds: 0.5 }, async (jobs) => {
    for (const job of jobs) await deliverOutboxEmail(job.data.outboxId);
  });
}
