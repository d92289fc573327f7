import { route } from "@/lib/server/route-handler";
import { startCheckout } from "@/lib/server/services/payments";
import { checkoutSchema } from "@/lib/validation/quote";

// POST /api/payments/checkout { jobId, purpose } — where to send the payer: the hosted checkout, or (when a
// payment is already on its way) the page that waits for its confirmation.
export const POST = route({ permission: "payment.start", body: checkoutSchema }, async ({ viewer, body }) => {
  const result = await startCheckout({ jobId: body.jobId, customerId: viewer.id, purpose: body.purpose });
  if (result.kind === "redirect") return { kind: "redirect", url: result.url, paymentId: result.paymentId };
  return { kind: "confirming", url: `/portal/jobs/${body.jobId}/payment?payment=${result.paymentId}`, paymentId: result.paymentId };
});
