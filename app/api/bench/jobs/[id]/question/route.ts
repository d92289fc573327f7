import { transaction } from "@/db/transaction";
import { route } from "@/lib/api";
import { askQuestion } from "@/lib/services/bench";
import { questionSchema } from "@/lib/validation/bench";
import { jobIdFrom } from "../../../_lib/params";

// POST /api/bench/jobs/:id/question { question } — message + e-mail; the job waits on the owner.
export const POST = route<{ id: string }, typeof questionSchema>({ permission: "job.triage", body: questionSchema }, async ({ params, body, viewer }) => {
  const jobId = await jobIdFrom(params);
  return transaction((ctx) => askQuestion(ctx, { jobId, actorId: viewer.id, question: body.question }));
});
