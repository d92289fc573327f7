import "server-only";
import { and, eq } from "drizzle-orm";
import { jobs, payments, radioSets, user } from "@/db/schema";
import { transaction } from "@/db/transaction";
import { dayInZone, formatDay } from "@/lib/engine/dates";
import { isEngineError } from "@/lib/engine/engine-error";
import { parseJobNumber } from "@/lib/engine/jobs/queue-query";
import { jobNumber, STATE_LABEL } from "@/lib/engine/jobs/states";
import { toMinor } from "@/lib/engine/pricing/money";
import { audit } from "@/lib/server/audit";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";
import { loadJobAccount, settleIfNothingOwed } from "@/lib/server/services/account";
import { issueReceipt } from "@/lib/server/services/document-numbers";
import { transitionJob } from "@/lib/server/services/jobs";
import { readShopTimeZone } from "@/lib/server/services/shop";
import { moneyText } from "@/lib/validation/estimate";
import type { ManualPaymentValues } from "@/lib/validation/office";

// Cash and cheques handed over at the counter. They are payments like any other: counted by the one account
// of the job (accountOf through loadJobAccount), moving the job on exactly as an online payment would, and
// receipted with the next receipt number in the same transaction. Money is taken only while the job asks for
// some (the deposit after approval, the balance when the set is ready) and never beyond what is owed: the
// counter gives change, so an over-payment is refused rather than held as credit to refund.

/** The states in which a payment is asked for, and what it pays. */
const TAKES_MONEY = { approved: "deposit", balance_due: "balance" } as const;

export type ManualPaymentResult = {
  paymentId: string;
  receiptId: string;
  receiptNumber: string;
  jobId: string;
  jobState: string;
  /** True when this submit repeated one already recorded (same form key): nothing new was written. */
  replayed: boolean;
};

function amountInMinor(amount: string, exponent: number): number {
  try {
    return toMinor(amount, exponent, "amount");
  } catch (e) {
    if (isEngineError(e)) throw new AppError("invalid_input", "Some fields need attention.", { amount: `Amount: ${e.message}` });
    throw e;
  }
}

export async function recordManualPayment({
  values,
  actorId,
}: {
  values: ManualPaymentValues;
  actorId: string;
}): Promise<ManualPaymentResult> {
  const number = parseJobNumber(values.job);
  if (number === null)
    throw new AppError("invalid_input", "Some fields need attention.", { job: "Job: the job number as on its ticket, such as KL-0042." });
  const idempotencyKey = `manual:${values.idempotencyKey}`;
  return transaction(async (ctx) => {
    const { tx } = ctx;
    const [row] = await tx
      .select({ job: jobs, maker: radioSets.maker, model: radioSets.model, name: user.name, email: user.email })
      .from(jobs)
      .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
      .innerJoin(user, eq(user.id, jobs.customerId))
      .where(eq(jobs.number, number))
      .for("update", { of: jobs })
      .limit(1);
    if (!row) throw new AppError("invalid_input", "Some fields need attention.", { job: `Job: there is no job ${jobNumber(number)}.` });
    const { job } = row;
    // A double submit waits for the first on the job's lock, then finds what it recorded.
    const [earlier] = await tx.select().from(payments).where(eq(payments.idempotencyKey, idempotencyKey)).limit(1);
    if (earlier) {
      if (earlier.jobId !== job.id)
        throw new AppError("conflict", "This form was already used for another job. Reload the page and enter the payment again.");
      const receipt = await issueReceipt(ctx, earlier.id, actorId);
      const [now] = await tx.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, job.id)).limit(1);
      return {
        paymentId: earlier.id,
        receiptId: receipt.id,
        receiptNumber: receipt.number,
        jobId: job.id,
        jobState: now!.state,
        replayed: true,
      };
    }
    const purpose = TAKES_MONEY[job.state as keyof typeof TAKES_MONEY];
    const loaded = await loadJobAccount(tx, job.id);
    const { account, revision, currency, exponent } = loaded;
    if (!purpose || !revision || account.owedMinor === 0)
      throw new AppError(
        "conflict",
        `Nothing is owed on ${jobNumber(job.number)} at this stage ("${STATE_LABEL[job.state].staff}"): money is taken after the estimate is approved (the deposit) and when the set is ready (the balance).`,
      );
    const amountMinor = amountInMinor(values.amount, exponent);
    if (amountMinor <= 0)
      throw new AppError("invalid_input", "Some fields need attention.", { amount: "Amount: a payment must be more than zero." });
    if (amountMinor > account.owedMinor)
      throw new AppError("invalid_input", "Some fields need attention.", {
        amount: `Amount: ${moneyText(account.owedMinor, currency, exponent)} is owed on ${jobNumber(job.number)}; take at most that and give change for the rest.`,
      });
    const timeZone = await readShopTimeZone(tx);
    const paidAt = new Date();
    if (values.receivedOn > dayInZone(paidAt, timeZone))
      throw new AppError("invalid_input", "Some fields need attention.", {
        receivedOn: "Paid on: today or an earlier day, not a later one.",
      });
    const chequeNumber = values.method === "cheque" && values.chequeNumber ? values.chequeNumber : null;
    const [payment] = await tx
      .insert(payments)
      .values({
        jobId: job.id,
        revisionId: revision.id,
        purpose,
        amountMinor,
        currency,
        status: "paid",
        method: values.method,
        chequeNumber,
        receivedOn: values.receivedOn,
        idempotencyKey,
        createdBy: actorId,
        paidAt,
      })
      .returning();
    await audit(ctx, {
      actorId,
      action: "payment.manual",
      entity: "payment",
      entityId: payment!.id,
      before: { owedMinor: account.owedMinor, jobState: job.state },
      after: { purpose, amountMinor, currency, method: values.method, chequeNumber, receivedOn: values.receivedOn },
    });
    const receipt = await issueReceipt(ctx, payment!.id, actorId);
    const amountText = moneyText(amountMinor, currency, exponent);
    const after = await loadJobAccount(tx, job.id);
    if (job.state === "approved" && (after.paidDepositsMinor >= revision.depositMinor || after.account.owedMinor === 0)) {
      await transitionJob(ctx, {
        jobId: job.id,
        to: "deposit_paid",
        actor: "system",
        actorId,
        note: `Deposit of ${amountText} received by ${values.method} at the counter`,
      });
    } else if (job.state === "balance_due") {
      await settleIfNothingOwed(ctx, job.id, { actorId });
    }
    await queueEmail(ctx, {
      to: row.email,
      template: purpose === "deposit" ? "deposit-receipt" : "balance-receipt",
      props: {
        name: row.name,
        jobNumber: jobNumber(job.number),
        setName: `${row.maker} ${row.model}`,
        url: `${env().APP_URL}/portal/jobs/${job.id}`,
        amountText,
        paidAt: formatDay(values.receivedOn),
        reference: receipt.number,
      },
      dedupeKey: `receipt:${payment!.id}`,
    });
    const [now] = await tx.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, job.id)).limit(1);
    return {
      paymentId: payment!.id,
      receiptId: receipt.id,
      receiptNumber: receipt.number,
      jobId: job.id,
      jobState: now!.state,
      replayed: false,
    };
  });
}

/**
 * Voids a cash or cheque entry made by mistake: the row stays (status "voided", who, when, why; audited) and
 * stops counting in the account; its receipt keeps its number and prints VOID. Only while the job has not
 * moved on because of it (still waiting for the deposit or the balance), so no state has to be undone.
 */
export async function voidManualPayment({ paymentId, reason, actorId }: { paymentId: string; reason: string; actorId: string }) {
  return transaction(async (ctx) => {
    const { tx } = ctx;
    const [p] = await tx.select().from(payments).where(eq(payments.id, paymentId)).for("update").limit(1);
    if (!p) throw new AppError("not_found", "That payment was not found.");
    if (p.method === "card") throw new AppError("conflict", "Card payments are not voided; refund them instead.");
    if (p.status !== "paid") throw new AppError("conflict", "This entry is already voided.");
    const [job] = await tx.select({ state: jobs.state, number: jobs.number }).from(jobs).where(eq(jobs.id, p.jobId)).for("update").limit(1);
    if (!job || !(job.state in TAKES_MONEY))
      throw new AppError(
        "conflict",
        `${jobNumber(job?.number ?? 0)} has moved on ("${job ? STATE_LABEL[job.state].staff : "unknown"}") since this was recorded, so the entry can no longer be voided. Record a correction with the shop's accountant.`,
      );
    const voidedAt = new Date();
    await tx
      .update(payments)
      .set({ status: "voided", voidedBy: actorId, voidedAt, voidReason: reason })
      .where(and(eq(payments.id, paymentId), eq(payments.status, "paid")));
    await audit(ctx, {
      actorId,
      action: "payment.void",
      entity: "payment",
      entityId: paymentId,
      before: { status: "paid", amountMinor: p.amountMinor, method: p.method },
      after: { status: "voided", reason, voidedAt: voidedAt.toISOString() },
    });
    return { paymentId, status: "voided" as const };
  });
}
