import "server-only";
import { eq } from "drizzle-orm";
import { certificates, jobs, payments, radioSets, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { jobNumber } from "@/lib/engine/jobs/states";
import { formatMinor } from "@/lib/engine/pricing/money";
import { env } from "../env";
import { queueEmail } from "../mail";
import { getShop } from "./shop";

// The e-mails that tell a person an irreversible act was done to them, queued in the act's own transaction.

const portalJob = (jobId: string) => `${env().APP_URL.replace(/\/$/, "")}/portal/jobs/${jobId}`;

export async function queueStaffAccessNotice(ctx: TxContext, { userId, active }: { userId: string; active: boolean }): Promise<void> {
  const [person] = await ctx.tx.select({ name: user.name, email: user.email }).from(user).where(eq(user.id, userId));
  if (!person) return;
  const heading = active ? "Your workshop access is back" : "Your workshop access was turned off";
  await queueEmail(ctx, {
    to: person.email,
    template: "account-notice",
    props: {
      name: person.name,
      subject: heading,
      heading,
      paragraphs: active
        ? ["The shop owner reactivated your Bandedge account. You can sign in to the bench again with your password."]
        : [
            "The shop owner deactivated your Bandedge account. You were signed out everywhere and cannot sign in until the owner reactivates it.",
            "Your past work (readings, notes and certificates) stays on record.",
          ],
    },
    dedupeKey: `staff-access:${userId}:${active ? "on" : "off"}:${Date.now()}`,
  });
}

export async function queueRefundNotice(
  ctx: TxContext,
  {
    paymentId,
    refundId,
    amountMinor,
    kind = "return",
  }: { paymentId: string; refundId: string; amountMinor: number; kind?: "return" | "reduction" },
): Promise<void> {
  const [row] = await ctx.tx
    .select({ jobId: jobs.id, number: jobs.number, maker: radioSets.maker, model: radioSets.model, name: user.name, email: user.email })
    .from(payments)
    .innerJoin(jobs, eq(jobs.id, payments.jobId))
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(eq(payments.id, paymentId));
  if (!row) return;
  const { exponent, code } = (await getShop()).policy.currency;
  const amount = `${code} ${formatMinor(amountMinor, exponent)}`;
  await queueEmail(ctx, {
    to: row.email,
    template: "account-notice",
    props: {
      name: row.name,
      subject: `Refund of ${amount} for ${jobNumber(row.number)}`,
      heading: `A refund of ${amount} is on its way`,
      paragraphs: [
        `The shop is refunding ${amount} of your payment for the ${row.maker} ${row.model} (${jobNumber(row.number)}) to the card you paid with.`,
        ...(kind === "reduction"
          ? [`The shop has lowered the price of ${jobNumber(row.number)} by ${amount}: it is not to be paid again.`]
          : []),
        "Your bank shows it once the payment processor completes it, usually within a few working days.",
      ],
      url: portalJob(row.jobId),
      linkLabel: "See my job",
    },
    dedupeKey: `refund-notice:${refundId}`,
  });
}

export async function queueRevocationNotice(ctx: TxContext, { certificateId, reason }: { certificateId: string; reason: string }) {
  const [row] = await ctx.tx
    .select({ code: certificates.code, jobId: jobs.id, maker: radioSets.maker, model: radioSets.model, name: user.name, email: user.email })
    .from(certificates)
    .innerJoin(jobs, eq(jobs.id, certificates.jobId))
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, certificates.customerId))
    .where(eq(certificates.id, certificateId));
  if (!row) return;
  await queueEmail(ctx, {
    to: row.email,
    template: "account-notice",
    props: {
      name: row.name,
      subject: `Warranty certificate ${row.code} was revoked`,
      heading: "Your warranty certificate was revoked",
      paragraphs: [
        `The shop revoked certificate ${row.code} for your ${row.maker} ${row.model}. Reason given: ${reason}`,
        "The public verification page now shows it as revoked. If a corrected certificate is issued, you will receive it by e-mail.",
      ],
      url: portalJob(row.jobId),
      linkLabel: "See my job",
    },
    dedupeKey: `revoke-notice:${certificateId}`,
  });
}
