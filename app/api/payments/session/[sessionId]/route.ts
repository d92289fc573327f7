import { getPaymentBySessionForCustomer } from "@/db/queries/payments";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";

// GET /api/payments/session/:sessionId — the return page asks until the webhook has confirmed the payment.
export const GET = route<{ sessionId: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  if (!/^cs_[A-Za-z0-9_]{1,200}$/.test(params.sessionId)) throw new AppError("not_found", "That payment was not found.");
  const payment = await getPaymentBySessionForCustomer({ sessionId: params.sessionId, customerId: viewer.id });
  if (!payment) throw new AppError("not_found", "That payment was not found.");
  return { paymentId: payment.id, jobId: payment.jobId, purpose: payment.purpose, status: payment.status };
});
