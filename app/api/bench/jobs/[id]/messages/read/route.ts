import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { markThreadRead } from "@/lib/server/services/messages";
import { messageReadSchema } from "@/lib/validation/messages";
import { jobIdFrom } from "../../../../_lib/params";

// POST /api/bench/jobs/:id/messages/read { lastMessageId } — this staff member has seen the thread up to that message.
export const POST = route<{ id: string }, typeof messageReadSchema>(
  { permission: "bench.use", body: messageReadSchema },
  async ({ viewer, params, body }) => {
    const jobId = await jobIdFrom(params);
    return transaction((ctx) =>
      markThreadRead(ctx, { jobId, reader: { id: viewer.id, side: "staff" }, lastMessageId: body.lastMessageId }),
    );
  },
);
