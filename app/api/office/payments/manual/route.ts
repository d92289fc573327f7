import { json, route } from "@/lib/server/route-handler";
import { recordManualPayment } from "@/lib/server/services/manual-payments";
import { manualPaymentSchema } from "@/lib/validation/office";

// Cash or a cheque taken at the counter: recorded, receipted and counted at once (201; 200 for a repeat).
export const POST = route({ permission: "payment.record", body: manualPaymentSchema }, async ({ body, viewer }) => {
  const result = await recordManualPayment({ values: body, actorId: viewer.id });
  return json(result, { status: result.replayed ? 200 : 201 });
});
