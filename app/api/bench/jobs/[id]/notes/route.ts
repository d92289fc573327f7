import { transaction } from "@/db/transaction";
import { route } from "@/lib/api";
import { addBenchNote } from "@/lib/services/bench";
import { benchNoteSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/notes { body } — a workshop-only note.
export const POST = route<{ id: string }, typeof benchNoteSchema>({ permission: "bench.use", body: benchNoteSchema }, async ({ params, body, viewer }) => {
  const jobId = await jobIdFrom(params);
  return transaction((ctx) => addBenchNote(ctx, { jobId, actorId: viewer.id, body: body.body }));
});
