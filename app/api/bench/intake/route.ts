import { route } from "@/lib/server/route-handler";
import { jobNumber } from "@/lib/engine/jobs/states";
import { submitIntake } from "@/lib/server/services/intake";
import { intakeSchema } from "@/lib/validation/intake";

// POST /api/bench/intake — a set taken in at the counter or on the phone: the customer (found or added), the
// set profile, the counter's photos. The same idempotency key gives the same job and the same customer.
export const POST = route({ permission: "job.intake", body: intakeSchema }, async ({ viewer, body }) => {
  const result = await submitIntake({ input: body, actor: { id: viewer.id, name: viewer.name } });
  return Response.json(
    {
      jobId: result.jobId,
      number: jobNumber(result.number),
      customerId: result.customerId,
      invited: result.invited,
      duplicate: result.duplicate,
    },
    { status: result.duplicate ? 200 : 201, headers: { "cache-control": "no-store" } },
  );
});
