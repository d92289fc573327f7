import { route } from "@/lib/server/route-handler";
import { addBenchNote } from "@/lib/server/services/bench";
import { inMessageTransaction } from "@/lib/server/services/messages";
import { benchNoteSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/notes { body, idempotencyKey } — a workshop-only note; the same key again
// returns the first note (duplicate: true), another text under that key is refused (409).
export const POST = route<{ id: string }, typeof benchNoteSchema>(
  { permission: "bench.use", body: benchNoteSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return inMessageTransaction((ctx) =>
      addBenchNote(ctx, { jobId, actorId: viewer.id, body: body.body, idempotencyKey: body.idempotencyKey }),
    );
  },
);
