import "server-only";
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { and, asc, eq, ilike, inArray, isNull, ne, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { account, jobs, photos, radioSets, staffInvitation, user } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { placeholderEmail, shownEmail, type CustomerAccess } from "@/lib/engine/contacts";
import { jobNumber } from "@/lib/engine/jobs/states";
import { audit } from "@/lib/server/audit";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";
import { approveRevision, declineRevision } from "@/lib/server/services/approvals";
import { recordJobCreated, transitionJob } from "@/lib/server/services/jobs";
import { newSetValues } from "@/lib/server/services/quotes";
import { getShop } from "@/lib/server/services/shop";
import { INVITATION_DAYS } from "@/lib/server/services/staff-invitations";
import { readTicket, type PhotoTicket } from "@/lib/server/uploads/photos";
import type { Intake, RecordDecision } from "@/lib/validation/intake";

export type CustomerMatch = {
  id: string;
  name: string;
  email: string | null;
  phone: string | null;
  access: CustomerAccess;
  jobs: number;
};

const tokenHash = (token: string) => createHash("sha256").update(token).digest("hex");
const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

// Columns written out with their table: inside a select from "user", Drizzle names them bare, and a bare "id"
// in a subquery would be the subquery's own table's.
const accessSql = sql<CustomerAccess>`case
  when "user"."contact_only" then 'contact'
  when exists (select 1 from "account" a where a.user_id = "user"."id" and a.provider_id = 'credential') then 'account'
  when exists (select 1 from "staff_invitation" i where i.user_id = "user"."id" and i.used_at is null and i.expires_at > now()) then 'invited'
  else 'account' end`;

/** Set owners whose name, e-mail or phone contains the words typed at the counter (a phone's digits alone match too). */
export async function searchCustomers({ q }: { q: string }): Promise<CustomerMatch[]> {
  const like = `%${likeEscape(q)}%`;
  const digits = q.replace(/\D/g, "");
  const rows = await db
    .select({
      id: user.id,
      name: user.name,
      email: user.email,
      phone: user.phone,
      access: accessSql,
      jobs: sql<number>`(select count(*)::int from "job" j where j.customer_id = "user"."id")`,
    })
    .from(user)
    .where(
      and(
        eq(user.role, "customer"),
        or(
          ilike(user.name, like),
          and(ilike(user.email, like), sql`"user"."email" not like '%.invalid'`),
          ilike(user.phone, like),
          digits.length >= 4 ? sql`regexp_replace(coalesce("user"."phone", ''), '\\D', '', 'g') like ${`%${digits}%`}` : sql`false`,
        ),
      ),
    )
    .orderBy(asc(user.name))
    .limit(12);
  return rows.map((r) => ({ ...r, email: shownEmail(r.email) }));
}

type Staff = { id: string; name: string };
type Customer = { id: string; name: string; email: string; contactOnly: boolean; created: boolean };

// The customer named at the counter: the one chosen from the search, else the account already holding the
// e-mail (never a second account for one address), else a new one.
async function findOrCreateCustomer(ctx: TxContext, input: Intake, actor: Staff): Promise<Customer> {
  if (input.customerMode === "existing") {
    const [found] = await ctx.tx
      .select({ id: user.id, name: user.name, email: user.email, contactOnly: user.contactOnly })
      .from(user)
      .where(and(eq(user.id, input.customerId), eq(user.role, "customer")))
      .limit(1);
    if (!found)
      throw new AppError("invalid_input", "Some fields need attention.", {
        customerId: "Customer: that customer was not found. Search again or add a new customer.",
      });
    return { ...found, created: false };
  }
  if (input.customerEmail) {
    const [byEmail] = await ctx.tx
      .select({ id: user.id, name: user.name, email: user.email, role: user.role, contactOnly: user.contactOnly })
      .from(user)
      .where(sql`lower(${user.email}) = ${input.customerEmail}`)
      .for("update")
      .limit(1);
    if (byEmail && byEmail.role !== "customer")
      throw new AppError("invalid_input", "Some fields need attention.", {
        customerEmail: "Customer's e-mail: this address belongs to a staff account; staff and customer accounts are kept apart.",
      });
    if (byEmail) {
      if (!byEmail.contactOnly || input.access === "contact") {
        if (input.customerPhone) await ctx.tx.update(user).set({ phone: input.customerPhone }).where(eq(user.id, byEmail.id));
        return { id: byEmail.id, name: byEmail.name, email: byEmail.email, contactOnly: byEmail.contactOnly, created: false };
      }
      // A contact who now wants to sign in: the invitation below gives them a password.
      await ctx.tx.update(user).set({ contactOnly: false, updatedAt: new Date() }).where(eq(user.id, byEmail.id));
      return { id: byEmail.id, name: byEmail.name, email: byEmail.email, contactOnly: false, created: false };
    }
  }
  const id = randomUUID();
  const email = input.customerEmail || placeholderEmail(id);
  const contactOnly = input.access === "contact";
  await ctx.tx.insert(user).values({
    id,
    name: input.customerName,
    email,
    // The shop saw the person and took the address from them; the invitation link proves it when used.
    emailVerified: false,
    role: "customer",
    phone: input.customerPhone || null,
    contactOnly,
  });
  await audit(ctx, {
    actorId: actor.id,
    action: "customer.create_at_intake",
    entity: "user",
    entityId: id,
    before: null,
    after: { name: input.customerName, email: shownEmail(email), phone: input.customerPhone || null, contactOnly },
  });
  return { id, name: input.customerName, email, contactOnly, created: true };
}

async function hasCredential(ctx: TxContext, userId: string): Promise<boolean> {
  const [row] = await ctx.tx
    .select({ id: account.id })
    .from(account)
    .where(and(eq(account.userId, userId), eq(account.providerId, "credential")))
    .limit(1);
  return !!row;
}

export type IntakeResult = { jobId: string; number: number; customerId: string; duplicate: boolean; invited: boolean };

/**
 * Takes a set in at the counter or on the phone, in the caller's transaction: the customer (found or added,
 * invited to set a password or kept as a contact), the set with the profile the online request stores, the
 * job with its channel and photos, then triage at once (the shop already has the request in hand). A set
 * handed over at the counter is marked received, so its bench work starts as soon as the deposit is in.
 */
export async function takeInJob(
  ctx: TxContext,
  { input, actor, tickets }: { input: Intake; actor: Staff; tickets: PhotoTicket[] },
): Promise<IntakeResult> {
  const customer = await findOrCreateCustomer(ctx, input, actor);
  const keys = tickets.map((t) => t.key);
  if (keys.length) {
    const used = await ctx.tx.select({ id: photos.id }).from(photos).where(inArray(photos.storageKey, keys)).limit(1);
    if (used.length)
      throw new AppError("invalid_input", "Some fields need attention.", {
        photos: "Photos: one of these photos is already attached to a job. Please take it again.",
      });
  }
  const [set] = await ctx.tx.insert(radioSets).values(newSetValues(customer.id, input)).returning({ id: radioSets.id });
  const now = new Date();
  const atShop = input.channel === "counter" && input.setAtShop;
  const [job] = await ctx.tx
    .insert(jobs)
    .values({
      setId: set!.id,
      customerId: customer.id,
      symptoms: input.symptoms,
      priorWork: input.priorWork,
      poweredRecently: input.poweredRecently,
      delivery: input.channel === "counter" ? "drop-off" : "mail-in",
      contactPreference: input.contactPreference,
      channel: input.channel,
      cautionsAcknowledgedAt: now,
      idempotencyKey: input.idempotencyKey,
    })
    .returning({ id: jobs.id, number: jobs.number });
  if (tickets.length)
    await ctx.tx.insert(photos).values(
      tickets.map((t) => ({
        uploaderId: actor.id,
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
  await recordJobCreated(ctx, { jobId: job!.id, actorId: actor.id });
  await audit(ctx, {
    actorId: actor.id,
    action: "job.intake",
    entity: "job",
    entityId: job!.id,
    before: null,
    after: { channel: input.channel, setAtShop: atShop, customerId: customer.id, customerCreated: customer.created, photos: keys.length },
  });
  await transitionJob(ctx, {
    jobId: job!.id,
    to: "in_triage",
    actor: "staff",
    actorId: actor.id,
    note: atShop
      ? "Taken in at the counter; the set is at the shop"
      : input.channel === "counter"
        ? "Taken in at the counter"
        : "Taken in by phone",
    patch: atShop ? { receivedAt: now } : {},
  });

  const setName = `${input.maker} ${input.model}`;
  const number = jobNumber(job!.number);
  const base = env().APP_URL.replace(/\/$/, "");
  let invited = false;
  if (!customer.contactOnly && input.customerMode === "new" && input.access === "invite" && !(await hasCredential(ctx, customer.id))) {
    const token = randomBytes(32).toString("base64url");
    const invitationId = randomUUID();
    await ctx.tx.insert(staffInvitation).values({
      id: invitationId,
      userId: customer.id,
      tokenHash: tokenHash(token),
      role: "customer",
      invitedBy: actor.id,
      expiresAt: sql`now() + make_interval(days => ${INVITATION_DAYS})`,
    });
    await audit(ctx, {
      actorId: actor.id,
      action: "customer.invite",
      entity: "user",
      entityId: customer.id,
      after: { invitationId, jobId: job!.id },
    });
    const shop = await getShop(ctx.tx);
    await queueEmail(ctx, {
      to: customer.email,
      template: "owner-invite",
      props: { name: customer.name, url: `${base}/welcome?token=${token}`, jobNumber: number, setName, shopName: shop.name },
      dedupeKey: `owner-invite:${invitationId}`,
    });
    invited = true;
  } else {
    // Reaches a contact's address too (a phone-only contact has none; queueEmail leaves it).
    await queueEmail(ctx, {
      to: customer.email,
      template: "quote-received",
      props: {
        name: customer.name,
        jobNumber: number,
        setName,
        url: `${base}/portal/jobs/${job!.id}`,
        delivery: input.channel === "counter" ? "drop-off" : "mail-in",
      },
      dedupeKey: `quote-received:${job!.id}`,
    });
  }
  return { jobId: job!.id, number: job!.number, customerId: customer.id, duplicate: false, invited };
}

/** The intake form's submission: the same idempotency key twice gives the same job, never a second customer. */
export async function submitIntake({ input, actor }: { input: Intake; actor: Staff }): Promise<IntakeResult> {
  const tickets = input.photos.map((t) => readTicket(t, actor.id));
  if (new Set(tickets.map((t) => t.key)).size !== tickets.length)
    throw new AppError("invalid_input", "Some fields need attention.", { photos: "Photos: the same photo was added twice." });
  const findExisting = async () => {
    const [row] = await db
      .select({ id: jobs.id, number: jobs.number, customerId: jobs.customerId })
      .from(jobs)
      .where(and(eq(jobs.idempotencyKey, input.idempotencyKey), ne(jobs.channel, "online")))
      .limit(1);
    return row;
  };
  const existing = await findExisting();
  if (existing) return { jobId: existing.id, number: existing.number, customerId: existing.customerId, duplicate: true, invited: false };
  try {
    return await transaction((ctx) => takeInJob(ctx, { input, actor, tickets }));
  } catch (error) {
    const code = (error as { code?: string }).code ?? (error as { cause?: { code?: string } }).cause?.code;
    if (code === "23505") {
      const again = await findExisting();
      if (again) return { jobId: again.id, number: again.number, customerId: again.customerId, duplicate: true, invited: false };
    }
    throw error;
  }
}

/** A decision on the current estimate the owner gave in person, by phone or in writing, recorded by staff. */
export async function recordOwnerDecision(
  ctx: TxContext,
  { jobId, input, staffId }: { jobId: string; input: RecordDecision; staffId: string },
) {
  const [job] = await ctx.tx.select({ customerId: jobs.customerId }).from(jobs).where(eq(jobs.id, jobId)).limit(1);
  if (!job) throw new AppError("not_found", "That job was not found.");
  const recorded = { staffId, medium: input.medium, note: input.note };
  if (input.decision === "approve") {
    const result = await approveRevision(ctx, { jobId, customerId: job.customerId, revisionId: input.revisionId, recorded });
    return { decision: "approve" as const, depositDueMinor: result.depositDueMinor };
  }
  await declineRevision(ctx, {
    jobId,
    customerId: job.customerId,
    revisionId: input.revisionId,
    reason: input.note,
    afterDecline: input.afterDecline,
    recorded,
  });
  return { decision: "decline" as const, depositDueMinor: 0 };
}

/** Whether a customer's account has been invited and not yet used the invitation (for the job's page). */
export async function pendingInvitation(userId: string): Promise<boolean> {
  const [row] = await db
    .select({ id: staffInvitation.id })
    .from(staffInvitation)
    .where(and(eq(staffInvitation.userId, userId), isNull(staffInvitation.usedAt), sql`${staffInvitation.expiresAt} > now()`))
    .limit(1);
  return !!row;
}
