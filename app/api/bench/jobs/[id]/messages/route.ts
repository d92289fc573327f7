import { route } from "@/lib/server/route-handler";
import { getStaffThread, inMessageTransaction, postMessage } from "@/lib/server/services/messages";
import { messageSchema } from "@/lib/validation/messages";
import { jobIdFrom } from "../../../_lib/params";

// GET /api/bench/jobs/:id/messages — the whole thread, workshop notes included, with photos and unread marks.
export const GET = route<{ id: string }>({ permission: "bench.use" }, async ({ viewer, params }) => {
  const jobId = await jobIdFrom(params);
  return getStaffThread({ jobId, viewerId: viewer.id });
});

// POST /api/bench/jobs/:id/messages { body, idempotencyKey, photos? } — a message the owner reads (and gets
// by e-mail), at any state; it moves nothing. Questions that put the job on hold go through /question;
// workshop-only notes through /notes. The same key again returns the first message (duplicate: true).
export const POST = route<{ id: string }, typeof messageSchema>(
  { permission: "bench.use", body: messageSchema },
  async ({ viewer, params, body }) => {
    const jobId = await jobIdFrom(params);
    const row = await inMessageTransaction((ctx) =>
      postMessage(ctx, {
        jobId,
        author: { id: viewer.id, side: "staff" },
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
