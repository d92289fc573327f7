import { z } from "@/lib/engine/zod";
import { json, route } from "@/lib/server/route-handler";
import { notFound } from "@/lib/server/errors";
import { requestRefund } from "@/lib/server/services/refunds";
import { refundRequestSchema } from "@/lib/validation/office";

// Starts a refund; it is confirmed later by the processor's webhook (202: accepted, not yet settled).
export const POST = route<{ paymentId: string }, typeof refundRequestSchema>(
  { permission: "payment.refund", body: refundRequestSchema },
  async ({ params, body, viewer }) => {
    if (!z.uuid().safeParse(params.paymentId).success) throw notFound("That payment");
    const refund = await requestRefund({ paymentId: params.paymentId, input: body, actorId: viewer.id });
    return json(refund, { status: 202 });
  },
);
