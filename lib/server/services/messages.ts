import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { listMessagesForStaff } from "@/db/queries/bench";
import { listPhotosForMessages } from "@/db/queries/photos";
import { jobs, messageReads, messages, photos, radioSets, user } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { jobNumber } from "@/lib/engine/jobs/states";
import { audit } from "@/lib/server/audit";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";
import { notifyStaff } from "@/lib/server/services/notifications";
import { transitionJob } from "@/lib/server/services/jobs";
import { readTicket, type PhotoTicket } from "@/lib/server/uploads/photos";

type Author = { id: string; side: "customer" | "staff" };

export type KeyedMessage = {
  jobId: string;
  authorId: string;
  idempotencyKey: string;
  body: string;
  internal: boolean;
  isQuestion: boolean;
};

export const KEY_REUSED_MESSAGE =
  "This message key was already used for a different message. Reload the page to see what was sent, then send your text again.";

/**
 * The message this author already stored on this job under this key: a repeat of the same post (a retry
 * after a lost answer) gets the original back and stores nothing; the same key with other content is
 * refused. Call it after locking the job row, so two posts with one key cannot both miss each other.
 */
export async function findKeyedMessage(ctx: TxContext, m: KeyedMessage): Promise<{ id: string; createdAt: Date } | null> {
  const [row] = await ctx.tx
    .select({
      id: messages.id,
      createdAt: messages.createdAt,
      body: messages.body,
      internal: messages.internal,
      isQuestion: messages.isQuestion,
    })
    .from(messages)
    .where(and(eq(messages.authorId, m.authorId), eq(messages.jobId, m.jobId), eq(messages.idempotencyKey, m.idempotencyKey)))
    .limit(1);
  if (!row) return null;
  if (row.body !== m.body || row.internal !== m.internal || row.isQuestion !== m.isQuestion) {
    throw new AppError("conflict", KEY_REUSED_MESSAGE, { idempotencyKey: KEY_REUSED_MESSAGE });
  }
  return { id: row.id, createdAt: row.createdAt };
}

function isKeyViolation(e: unknown): boolean {
  const err = e as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  const code = err.code ?? err.cause?.code;
  const constraint = err.constraint ?? err.cause?.constraint;
  return code === "23505" && constraint === "message_idempotency_key_idx";
}

/**
 * Runs a message post in its own transaction. The job lock makes a second post with the same key wait and
 * then find the first; should two ever race past it anyway, the unique index refuses one, and running it
 * again answers with the stored message.
 */
export async function inMessageTransaction<T>(fn: (ctx: TxContext) => Promise<T>): Promise<T> {
  try {
    return await transaction(fn);
  } catch (e) {
    if (!isKeyViolation(e)) throw e;
    return transaction(fn);
  }
}

/** Reads the signed upload tickets a message carries: each the author's own, none used before. */
async function photosFromTickets(ctx: TxContext, tokens: readonly string[], authorId: string): Promise<PhotoTicket[]> {
  const tickets = tokens.map((t) => readTicket(t, authorId));
  const keys = new Set(tickets.map((t) => t.key));
  if (keys.size !== tickets.length) {
    throw new AppError("invalid_input", "The same photo was added twice.", { photos: "The same photo was added twice." });
  }
  if (keys.size) {
    const used = await ctx.tx
      .select({ id: photos.id })
      .from(photos)
      .where(inArray(photos.storageKey, [...keys]))
      .limit(1);
    if (used.length) {
      const message = "One of these photos is already attached elsewhere. Please add it again.";
      throw new AppError("invalid_input", message, { photos: message });
    }
  }
  return tickets;
}

/**
 * One message on a job's thread, at any state of the job, with up to a few photos that went through the
 * upload checks (their tickets). Customers write only on their own jobs and never internal notes; an answer
 * while the shop is waiting on the owner sends the job back to triage, any other message moves nothing. A
 * staff message the owner can read is e-mailed to them (one e-mail per message). Staff may mark a note
 * internal (text only). The same idempotency key from the same author on the same job returns the first
 * message (duplicate: true) without a second row, audit entry, e-mail or state change.
 */
export async function postMessage(
  ctx: TxContext,
  input: { jobId: string; author: Author; body: string; idempotencyKey: string; internal?: boolean; photos?: readonly string[] },
): Promise<{ id: string; createdAt: Date; duplicate: boolean }> {
  const where =
    input.author.side === "customer" ? and(eq(jobs.id, input.jobId), eq(jobs.customerId, input.author.id)) : eq(jobs.id, input.jobId);
  const [job] = await ctx.tx
    .select({
      id: jobs.id,
      state: jobs.state,
      number: jobs.number,
      customerId: jobs.customerId,
      setId: jobs.setId,
      technicianId: jobs.technicianId,
    })
    .from(jobs)
    .where(where)
    .for("update")
    .limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const internal = input.author.side === "staff" && input.internal === true;
  const keyed: KeyedMessage = {
    jobId: job.id,
    authorId: input.author.id,
    idempotencyKey: input.idempotencyKey,
    body: input.body,
    internal,
    isQuestion: false,
  };
  const existing = await findKeyedMessage(ctx, keyed);
  if (existing) return { ...existing, duplicate: true };
  const tokens = input.photos ?? [];
  if (internal && tokens.length) {
    const message = "Workshop notes are text only; send photos in a message to the owner.";
    throw new AppError("invalid_input", message, { photos: message });
  }
  const tickets = await photosFromTickets(ctx, tokens, input.author.id);
  const [row] = await ctx.tx
    .insert(messages)
    .values({ jobId: job.id, authorId: input.author.id, body: input.body, internal, idempotencyKey: input.idempotencyKey })
    .returning({ id: messages.id, createdAt: messages.createdAt });
  if (tickets.length) {
    await ctx.tx.insert(photos).values(
      tickets.map((t) => ({
        uploaderId: input.author.id,
        jobId: job.id,
        messageId: row!.id,
        storageKey: t.key,
        thumbKey: t.thumbKey,
        displayName: t.name,
        mime: "image/jpeg",
        width: t.width,
        height: t.height,
        bytes: t.bytes,
      })),
    );
  }
  await audit(ctx, {
    actorId: input.author.id,
    action: internal ? "message.internal" : "message.post",
    entity: "message",
    entityId: row!.id,
    before: null,
    after: { jobId: job.id, photos: tickets.length },
  });
  // Whoever writes has read the thread up to their own message.
  await markReadUpTo(ctx, { jobId: job.id, userId: input.author.id, messageId: row!.id });
  if (input.author.side === "customer" && job.state === "awaiting_owner") {
    await transitionJob(ctx, { jobId: job.id, to: "in_triage", actor: "customer", actorId: input.author.id, note: "The owner answered" });
  }
  if (input.author.side === "customer") {
    // Only the owner's own words go out: the notification carries this message, never the thread's notes.
    const [who] = await ctx.tx
      .select({ name: user.name, maker: radioSets.maker, model: radioSets.model })
      .from(user)
      .innerJoin(radioSets, eq(radioSets.id, job.setId))
      .where(eq(user.id, job.customerId))
      .limit(1);
    await notifyStaff(ctx, {
      kind: "owner_message",
      jobId: job.id,
      technicianId: job.technicianId,
      actorId: input.author.id,
      title: `Message from ${who?.name ?? "the owner"} on ${jobNumber(job.number)}${who ? `: ${who.maker} ${who.model}` : ""}`,
      body: tickets.length ? `${input.body}\n(${tickets.length === 1 ? "one photo" : `${tickets.length} photos`} attached)` : input.body,
      dedupeKey: `message:${row!.id}`,
    });
  }
  if (input.author.side === "staff" && !internal) {
    const [who] = await ctx.tx
      .select({ email: user.email, name: user.name, maker: radioSets.maker, model: radioSets.model })
      .from(user)
      .innerJoin(radioSets, eq(radioSets.id, job.setId))
      .where(eq(user.id, job.customerId))
      .limit(1);
    const [author] = await ctx.tx.select({ name: user.name }).from(user).where(eq(user.id, input.author.id)).limit(1);
    if (who) {
      await queueEmail(ctx, {
        to: who.email,
        template: "shop-message",
        props: {
          name: who.name,
          jobNumber: jobNumber(job.number),
          setName: `${who.maker} ${who.model}`,
          from: (author?.name ?? "The shop").split(" ")[0]!,
          message: input.body,
          photoCount: tickets.length,
          url: `${env().APP_URL}/portal/jobs/${job.id}`,
        },
        dedupeKey: `shop-message:${row!.id}`,
      });
    }
  }
  return { id: row!.id, createdAt: row!.createdAt, duplicate: false };
}

// The read-at is copied from the message's own timestamp inside the database: PostgreSQL keeps microseconds,
// a JavaScript Date only milliseconds, and a rounded copy would leave the message itself unread.
async function markReadUpTo(ctx: TxContext, { jobId, userId, messageId }: { jobId: string; userId: string; messageId: string }) {
  const upTo = sql`(select ${messages.createdAt} from ${messages} where ${messages.id} = ${messageId})`;
  await ctx.tx
    .insert(messageReads)
    .values({ jobId, userId, readUpTo: upTo })
    .onConflictDoUpdate({
      target: [messageReads.jobId, messageReads.userId],
      set: { readUpTo: sql`greatest(${messageReads.readUpTo}, excluded.read_up_to)` },
    });
}

/**
 * The reader has seen the thread up to this message (one they may read on this job): later messages stay
 * unread. Marking by message, not by clock, keeps a message that arrived while the page was open unread.
 */
export async function markThreadRead(
  ctx: TxContext,
  input: { jobId: string; reader: Author; lastMessageId: string },
): Promise<{ readUpTo: string }> {
  const owner = input.reader.side === "customer" ? eq(jobs.customerId, input.reader.id) : undefined;
  const [job] = await ctx.tx
    .select({ id: jobs.id })
    .from(jobs)
    .where(and(eq(jobs.id, input.jobId), owner))
    .limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const visible = input.reader.side === "customer" ? eq(messages.internal, false) : undefined;
  const [msg] = await ctx.tx
    .select({ createdAt: messages.createdAt })
    .from(messages)
    .where(and(eq(messages.id, input.lastMessageId), eq(messages.jobId, job.id), visible))
    .limit(1);
  if (!msg) {
    const message = "That message is not on this job's thread. Reload the page.";
    throw new AppError("invalid_input", message, { lastMessageId: message });
  }
  await markReadUpTo(ctx, { jobId: job.id, userId: input.reader.id, messageId: input.lastMessageId });
  return { readUpTo: msg.createdAt.toISOString() };
}

/** The job's messages written after this person last read its thread (compared in the database, to the microsecond). */
export async function messagesAfterReadAt(tx: Database, { jobId, userId }: { jobId: string; userId: string }): Promise<Set<string>> {
  const rows = await tx
    .select({ id: messages.id })
    .from(messages)
    .where(
      and(
        eq(messages.jobId, jobId),
        sql`${messages.createdAt} > coalesce((select ${messageReads.readUpTo} from ${messageReads} where ${messageReads.jobId} = ${jobId} and ${messageReads.userId} = ${userId}), '-infinity')`,
      ),
    );
  return new Set(rows.map((r) => r.id));
}

const photoLinks = (p: { id: string; displayName: string; width: number; height: number }) => ({
  id: p.id,
  name: p.displayName,
  width: p.width,
  height: p.height,
  url: `/api/photos/${p.id}`,
  thumbUrl: `/api/photos/${p.id}?size=thumb`,
});

/**
 * The whole thread as the workshop sees it (notes included), each message with its photos and whether this
 * staff member has read it; the owner's messages after their read-at are the unread ones.
 */
export async function getStaffThread({ jobId, viewerId }: { jobId: string; viewerId: string }) {
  const [job] = await db.select({ customerId: jobs.customerId }).from(jobs).where(eq(jobs.id, jobId)).limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const [rows, after] = await Promise.all([listMessagesForStaff({ jobId }), messagesAfterReadAt(db, { jobId, userId: viewerId })]);
  const pics = await listPhotosForMessages({ messageIds: rows.map((r) => r.id) });
  const list = rows.map((r) => ({
    id: r.id,
    body: r.body,
    internal: r.internal,
    isQuestion: r.isQuestion,
    fromOwner: r.authorId === job.customerId,
    mine: r.authorId === viewerId,
    authorName: r.authorName,
    createdAt: r.createdAt.toISOString(),
    unread: r.authorId === job.customerId && after.has(r.id),
    photos: pics.filter((p) => p.messageId === r.id).map(photoLinks),
  }));
  return { messages: list, unread: list.filter((m) => m.unread).length };
}

export type StaffThread = Awaited<ReturnType<typeof getStaffThread>>;
export type StaffThreadMessage = StaffThread["messages"][number];
