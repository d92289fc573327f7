import { z } from "@/lib/engine/zod";
import { route } from "@/lib/server/route-handler";
import { notFound } from "@/lib/server/errors";
import { reconcileRefund } from "@/lib/server/services/refunds";

// Nothing to send: the refund is named by the URL, and anything else in the body is refused.
const checkSchema = z.strictObject({});

// Asks the processor what became of a refund still open: read back, or asked again with the same key.
export const POST = route<{ refundId: string }, typeof checkSchema>(
  { permission: "payment.refund", body: checkSchema },
  async ({ params, viewer }) => {
    if (!z.uuid().safeParse(params.refundId).success) throw notFound("That refund");
    return reconcileRefund({ refundId: params.refundId, actorId: viewer.id });
  },
);
