import { z } from "@/lib/engine/zod";
import { route } from "@/lib/server/route-handler";
import { notFound } from "@/lib/server/errors";
import { voidManualPayment } from "@/lib/server/services/manual-payments";
import { voidPaymentSchema } from "@/lib/validation/office";

// Voids a cash or cheque entry made by mistake; the row and its receipt stay, marked void.
export const POST = route<{ paymentId: string }, typeof voidPaymentSchema>(
  { permission: "payment.record", body: voidPaymentSchema },
  async ({ params, body, viewer }) => {
    if (!z.uuid().safeParse(params.paymentId).success) throw notFound("That payment");
    return voidManualPayment({ paymentId: params.paymentId, reason: body.reason, actorId: viewer.id });
  },
);
