import { route } from "@/lib/server/route-handler";
import { askQuestion } from "@/lib/server/services/bench";
import { inMessageTransaction } from "@/lib/server/services/messages";
import { questionSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/question { question, idempotencyKey } — message + e-mail; the job waits on the
// owner. The same key again returns the first question (duplicate: true) with no second e-mail.
export const POST = route<{ id: string }, typeof questionSchema>(
  { permission: "job.triage", body: questionSchema },
  async ({ params, body, viewer }) => {
    const jobId = await jobIdFrom(params);
    return inMessageTransaction((ctx) =>
      askQuestion(ctx, { jobId, actorId: viewer.id, question: body.question, idempotencyKey: body.idempotencyKey }),
    );
  },
);
