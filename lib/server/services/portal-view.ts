import "server-only";
import { ownerForecast } from "./turnaround";
import { db } from "@/db";
import { listPaymentsForCustomer, listRefundsForCustomer } from "@/db/queries/payments";
import { listPhotosForMessages } from "@/db/queries/photos";
import { accountOf, remainderBelowMinimum } from "@/lib/engine/pricing/account";
import { depositToCollect, recordedProcessorMinimum } from "@/lib/engine/pricing/deposit";
import {
  getPortalJobForCustomer,
  listMessagesForCustomer,
  listPhotosForCustomer,
  listRevisionsForCustomer,
  listTimelineForCustomer,
} from "@/db/queries/portal";
import type { JobState } from "@/lib/engine/jobs/states";
import { billingNote } from "@/lib/engine/pricing/billing-note";
import { AppError } from "@/lib/server/errors";
import { formatPostalAddress } from "@/lib/engine/addresses";
import { canChooseReturnAddress } from "@/lib/server/services/owner-account";
import { messagesAfterReadAt } from "@/lib/server/services/messages";
import { jobNumber, ownerStateLabel, STATE_LABEL } from "@/lib/engine/jobs/states";
import {
  coveredWording,
  coveredWordingInEstimate,
  exclusionWording,
  type CoveredWordingKey,
  type ExclusionCode,
} from "@/lib/engine/warranty/exclusions";
import { CATEGORY_LABEL, moneyText, type DraftCategory } from "@/lib/validation/estimate";

// What a set owner may see of a job, shaped field by field: no cost prices, markups, internal notes or staff ids.

type Money = { minor: number; text: string };

function pricingNumber(p: Record<string, unknown>, key: string, fallback = 0): number {
  const v = p[key];
  return typeof v === "number" && Number.isFinite(v) ? v : fallback;
}

function warrantyOf(p: Record<string, unknown>) {
  const w = (p.warranty ?? {}) as { termDays?: unknown; designation?: unknown; coveredKeys?: unknown; excludedKeys?: unknown };
  const covered = Array.isArray(w.coveredKeys)
    ? w.coveredKeys.filter((k): k is CoveredWordingKey => typeof k === "string" && k in coveredWording)
    : [];
  const excluded = Array.isArray(w.excludedKeys)
    ? w.excludedKeys.filter((k): k is ExclusionCode => typeof k === "string" && k in exclusionWording)
    : [];
  return {
    termDays: typeof w.termDays === "number" ? w.termDays : 0,
    designation: w.designation === "full" ? "full" : "limited",
    // The estimate comes before the work: its cover speaks of the certificate to come, not of "this certificate".
    covers: covered.map((k) => coveredWordingInEstimate[k]),
    excludes: excluded.map((k) => exclusionWording[k]),
  };
}

/**
 * How the revision's labour minutes were rounded, as priced when it was sent. Revisions sent before the
 * rounding was recorded were rounded on each line.
 */
function billingOf(
  pricing: Record<string, unknown>,
  lines: readonly { minutes: number; quantity: number; coveredByWarranty: number }[],
): { note: string; roundingLabourMinor: number } {
  const worked = lines.reduce((s, l) => s + (l.coveredByWarranty > 0 ? 0 : l.minutes * l.quantity), 0);
  const billed = pricingNumber(pricing, "billedMinutes", worked);
  return {
    note: billingNote({
      billingRounding: pricing.billingRounding === "job" ? "job" : "line",
      billingIncrementMinutes: pricingNumber(pricing, "billingIncrementMinutes", 15),
      workedMinutes: pricingNumber(pricing, "workedMinutes", worked),
      billedMinutes: billed,
    }),
    roundingLabourMinor: pricingNumber(pricing, "roundingLabourMinor", 0),
  };
}

// The timeline tells what happened, in the past: the state labels speak of what is asked now ("send the set").
function timelineLabel(from: JobState | null, to: JobState, depositPaid: boolean, returnMethod: "pick-up" | "shipped" | null): string {
  if (to === "paid_in_full") return "Paid in full";
  if (to === "returned")
    return returnMethod === "shipped" ? "Shipped back to you" : returnMethod === "pick-up" ? "Collected from the shop" : "Returned";
  if (to === "deposit_paid") return depositPaid ? "Deposit received" : "Nothing to pay before the work";
  if (to === "bench_revision") return "A change to the work was proposed; the set stayed on the bench";
  if (to === "on_bench" && from === "bench_revision") return "Change answered; back to work on the bench";
  if (to === "on_bench") return "Set received; work started";
  return STATE_LABEL[to].owner;
}

const CATEGORY_ORDER: DraftCategory[] = ["inspection", "safety", "recap", "alignment", "mechanical", "test", "parts"];

export async function getPortalJobView({ jobId, customerId }: { jobId: string; customerId: string }) {
  const job = await getPortalJobForCustomer({ jobId, customerId });
  if (!job) throw new AppError("not_found", "That job was not found.");
  const [timeline, photoRows, revisions, paymentRows, refundRows, forecast] = await Promise.all([
    listTimelineForCustomer({ jobId, customerId }),
    listPhotosForCustomer({ jobId, customerId }),
    listRevisionsForCustomer({ jobId, customerId }),
    listPaymentsForCustomer({ jobId, customerId }),
    listRefundsForCustomer({ jobId, customerId }),
    // Where the set stands in the bench queue while it waits for it.
    ownerForecast({ jobId, state: job.state }),
  ]);

  const current = revisions[0];
  const exponent = current ? pricingNumber(current.pricing, "exponent", 2) : 2;
  const currency = current?.currency ?? "USD";
  const m = (minor: number): Money => ({ minor, text: moneyText(minor, currency, exponent) });

  const paidDeposits = paymentRows.filter((p) => p.status === "paid" && p.purpose === "deposit").reduce((s, p) => s + p.amountMinor, 0);
  const approved = revisions.find((r) => r.status === "approved");
  // The one account of the job: what is still owed and what the shop owes back.
  const account = accountOf({
    totalMinor: job.settledTotalMinor ?? approved?.totalMinor ?? 0,
    payments: paymentRows,
    refunds: refundRows,
    waivedMinor: job.waivedMinor,
  });
  let due: { purpose: "deposit" | "balance"; amount: Money } | null = null;
  const depositDue = approved
    ? depositToCollect(
        { depositMinor: approved.depositMinor, paidDepositsMinor: paidDeposits, owedMinor: account.owedMinor },
        recordedProcessorMinimum(approved.pricing),
      )
    : 0;
  if (approved && job.state === "approved" && depositDue > 0) due = { purpose: "deposit", amount: m(depositDue) };
  // A remainder below the processor's smallest charge is never offered for payment: the shop waives it.
  const belowMinimum = approved ? remainderBelowMinimum(account, recordedProcessorMinimum(approved.pricing)) > 0 : false;
  if (approved && job.state === "balance_due" && account.owedMinor > 0 && !belowMinimum)
    due = { purpose: "balance", amount: m(account.owedMinor) };
  const inFlight = paymentRows.find((p) => p.status === "processing");

  const estimate = current
    ? {
        id: current.id,
        revision: current.revision,
        status: current.status,
        sentAt: current.sentAt.toISOString(),
        decidedAt: current.decidedAt?.toISOString() ?? null,
        changeSummary: current.changeSummary,
        declineReason: current.declineReason,
        decidable: (job.state === "estimate_sent" || job.state === "bench_revision") && current.status === "sent",
        // A change asked while the set is on the bench: no deposit, the difference goes into the balance.
        atBench: job.state === "bench_revision" && current.status === "sent",
        approvedTotal: approved && approved.id !== current.id ? m(approved.totalMinor) : null,
        groups: CATEGORY_ORDER.map((category) => {
          const lines = current.lines.filter((l) => l.category === category);
          return {
            category,
            label: CATEGORY_LABEL[category],
            lines: lines.map((l) => ({
              id: l.id,
              title: l.title,
              reason: l.reason,
              minutes: l.minutes,
              quantity: l.quantity,
              labour: m(l.labourMinor),
              parts: m(l.partsMinor),
              coveredByWarranty: l.coveredByWarranty > 0,
            })),
            subtotal: m(lines.reduce((s, l) => s + l.labourMinor + l.partsMinor, 0)),
          };
        }).filter((g) => g.lines.length > 0),
        labour: m(current.labourMinor),
        billing: (() => {
          const b = billingOf(current.pricing, current.lines);
          return { note: b.note, rounding: m(b.roundingLabourMinor) };
        })(),
        parts: m(current.partsMinor),
        labourTax: m(pricingNumber(current.pricing, "labourTaxMinor")),
        partsTax: m(pricingNumber(current.pricing, "partsTaxMinor")),
        tax: m(current.taxMinor),
        total: m(current.totalMinor),
        deposit: m(current.depositMinor),
        balanceAfterDeposit: m(Math.max(0, current.totalMinor - current.depositMinor)),
        warranty: warrantyOf(current.pricing),
        earlier: revisions.slice(1).map((r) => ({
          revision: r.revision,
          status: r.status,
          total: m(r.totalMinor),
          changeSummary: r.changeSummary,
          sentAt: r.sentAt.toISOString(),
        })),
      }
    : null;

  return {
    job: {
      id: job.id,
      number: jobNumber(job.number),
      state: job.state,
      stateLabel: ownerStateLabel(job.state, job.returnMethod, job.receivedAt !== null),
      stateIcon: STATE_LABEL[job.state].icon,
      symptoms: job.symptoms,
      priorWork: job.priorWork,
      delivery: job.delivery,
      isWarranty: job.isWarranty,
      returnMethod: job.returnMethod,
      carrier: job.carrier,
      trackingNumber: job.trackingNumber,
      createdAt: job.createdAt.toISOString(),
      // Where the set goes back: the copy kept on the job once chosen; until then the owner picks from their book.
      returnAddress: job.returnAddress ? { lines: formatPostalAddress(job.returnAddress) } : null,
      canChooseReturnAddress: canChooseReturnAddress(job.state),
      set: { maker: job.set.maker, model: job.set.model, year: job.set.year, serial: job.set.serial, kind: job.set.kind },
    },
    timeline: timeline.map((t) => ({
      id: t.id,
      state: t.toState as JobState,
      label: timelineLabel(t.fromState, t.toState, paidDeposits > 0, job.returnMethod),
      icon: STATE_LABEL[t.toState].icon,
      at: t.at.toISOString(),
    })),
    photos: photoRows.map((p) => ({
      id: p.id,
      name: p.displayName,
      width: p.width,
      height: p.height,
      url: `/api/photos/${p.id}`,
      thumbUrl: `/api/photos/${p.id}?size=thumb`,
    })),
    estimate,
    payments: paymentRows
      .filter((p) => p.status !== "open" && p.status !== "expired")
      .map((p) => ({
        id: p.id,
        purpose: p.purpose,
        status: p.status,
        amount: m(p.amountMinor),
        refunded: m(p.refundedMinor),
        paidAt: p.paidAt?.toISOString() ?? null,
      })),
    due,
    account: {
      total: m(account.totalMinor),
      paid: m(account.paidMinor),
      refunded: m(account.refundedMinor),
      refundPending: m(account.refundPendingMinor),
      // A goodwill reduction of the price (given back with the refunds): the owner does not pay it again.
      reduced: m(account.reducedMinor),
      // The price once reductions are taken off.
      price: m(account.totalMinor - account.reducedMinor),
      owed: m(account.owedMinor),
      owedBack: m(account.owedBackMinor),
      // Still to pay, but below the smallest card payment: not asked for online, waived when the work is done.
      belowMinimum,
      // A remainder below the smallest card payment, waived by the shop when the balance fell due.
      waived: account.waivedMinor > 0 ? { ...m(account.waivedMinor), at: job.waivedAt?.toISOString() ?? null } : null,
    },
    confirming: Boolean(inFlight),
    forecast,
  };
}

export type PortalJobView = Awaited<ReturnType<typeof getPortalJobView>>;

export async function getPortalMessages({ jobId, customerId }: { jobId: string; customerId: string }) {
  const job = await getPortalJobForCustomer({ jobId, customerId });
  if (!job) throw new AppError("not_found", "That job was not found.");
  const [rows, after] = await Promise.all([
    listMessagesForCustomer({ jobId, customerId }),
    messagesAfterReadAt(db, { jobId, userId: customerId }),
  ]);
  // Ids from the owner-scoped query above: workshop notes, and so their photos, are never among them.
  const pics = await listPhotosForMessages({ messageIds: rows.map((r) => r.id) });
  return rows.map((r) => ({
    id: r.id,
    body: r.body,
    mine: r.authorId === customerId,
    from: r.authorId === customerId ? "You" : `${r.authorName.split(" ")[0]} at the shop`,
    isQuestion: r.isQuestion,
    createdAt: r.createdAt.toISOString(),
    unread: r.authorId !== customerId && after.has(r.id),
    photos: pics
      .filter((p) => p.messageId === r.id)
      .map((p) => ({ id: p.id, name: p.displayName, url: `/api/photos/${p.id}`, thumbUrl: `/api/photos/${p.id}?size=thumb` })),
  }));
}

export type PortalMessage = Awaited<ReturnType<typeof getPortalMessages>>[number];
