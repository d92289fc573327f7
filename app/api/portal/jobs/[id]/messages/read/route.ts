import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { markThreadRead } from "@/lib/server/services/messages";
import { messageReadSchema } from "@/lib/validation/messages";
import { idFrom } from "../../../../_lib/ids";

// POST /api/portal/jobs/:id/messages/read { lastMessageId } — the owner has seen the thread up to that message.
export const POST = route<{ id: string }, typeof messageReadSchema>(
  { permission: "portal.use", body: messageReadSchema },
  async ({ viewer, params, body }) => {
    const jobId = idFrom(params.id);
    return transaction((ctx) =>
      markThreadRead(ctx, { jobId, reader: { id: viewer.id, side: "customer" }, lastMessageId: body.lastMessageId }),
    );
  },
);
