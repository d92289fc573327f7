import { route } from "@/lib/server/route-handler";
import { inMessageTransaction, postMessage } from "@/lib/server/services/messages";
import { getPortalMessages } from "@/lib/server/services/portal-view";
import { messageSchema } from "@/lib/validation/messages";
import { idFrom } from "../../../_lib/ids";

// GET /api/portal/jobs/:id/messages — the thread as the owner sees it (no workshop notes), each message with
// its photos and whether the owner has read it.
export const GET = route<{ id: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  const messages = await getPortalMessages({ jobId: idFrom(params.id), customerId: viewer.id });
  return { messages, unread: messages.filter((m) => m.unread).length };
});

// POST /api/portal/jobs/:id/messages { body, idempotencyKey, photos? } — at any state; photos are the tickets
// of the message upload. The same key again gives the same message (200, duplicate: true) and stores
// nothing; the same key with another text is refused (409).
export const POST = route<{ id: string }, typeof messageSchema>(
  { permission: "portal.use", body: messageSchema },
  async ({ viewer, params, body }) => {
    const jobId = idFrom(params.id);
    const row = await inMessageTransaction((ctx) =>
      postMessage(ctx, {
        jobId,
        author: { id: viewer.id, side: "customer" },
        body: body.body,
        idempotencyKey: body.idempotencyKey,
        photos: body.photos,
      }),
    );
    return Response.json(
      { id: row.id, duplicate: row.duplicate },
      { status: row.duplicate ? 200 : 201, headers: { "cache-control": "no-store" } },
    );
  },
);
