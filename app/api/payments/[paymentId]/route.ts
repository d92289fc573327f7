import { getPaymentForCustomer } from "@/db/queries/payments";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { idFrom } from "../../portal/_lib/ids";

// GET /api/payments/:paymentId — one of the owner's own payments.
export const GET = route<{ paymentId: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  const payment = await getPaymentForCustomer({ paymentId: idFrom(params.paymentId, "That payment"), customerId: viewer.id });
  if (!payment) throw new AppError("not_found", "That payment was not found.");
  return {
    id: payment.id,
    jobId: payment.jobId,
    purpose: payment.purpose,
    status: payment.status,
    amountMinor: payment.amountMinor,
    currency: payment.currency,
    refundedMinor: payment.refundedMinor,
    paidAt: payment.paidAt?.toISOString() ?? null,
  };
});
