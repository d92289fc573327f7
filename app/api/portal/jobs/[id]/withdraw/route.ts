import { route } from "@/lib/server/route-handler";
import { withdrawQuote } from "@/lib/server/services/cancellations";
import { withdrawSchema } from "@/lib/validation/cancellation";
import { idFrom } from "../../../_lib/ids";

// POST /api/portal/jobs/:id/withdraw { reason? } — the owner takes back a request the shop has not started.
export const POST = route<{ id: string }, typeof withdrawSchema>(
  { permission: "quote.withdraw", body: withdrawSchema },
  async ({ viewer, params, body }) => withdrawQuote({ jobId: idFrom(params.id), customerId: viewer.id, reason: body.reason }),
);
