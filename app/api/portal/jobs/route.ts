import { listJobsForCustomer } from "@/db/queries/jobs";
import { route } from "@/lib/server/route-handler";
import { jobNumber, ownerStateLabel } from "@/lib/engine/jobs/states";
import { submitQuote } from "@/lib/server/services/quotes";
import { quoteRequestSchema } from "@/lib/validation/quote";

// GET /api/portal/jobs — the owner's jobs, newest activity first.
export const GET = route({ permission: "portal.use" }, async ({ viewer }) => {
  const rows = await listJobsForCustomer({ customerId: viewer.id });
  return {
    jobs: rows.map((j) => ({
      id: j.id,
      number: jobNumber(j.number),
      state: j.state,
      stateLabel: ownerStateLabel(j.state, j.returnMethod, j.receivedAt !== null),
      set: `${j.maker} ${j.model}${j.year ? ` (${j.year})` : ""}`,
      isWarranty: j.isWarranty,
      updatedAt: j.updatedAt.toISOString(),
      unreadMessages: j.unread,
    })),
  };
});

// POST /api/portal/jobs — a quote request with its photo tickets; the same idempotency key gives the same job.
export const POST = route({ permission: "quote.request", body: quoteRequestSchema }, async ({ viewer, body }) => {
  const result = await submitQuote(viewer, body);
  return Response.json(
    { jobId: result.jobId, number: jobNumber(result.number), duplicate: result.duplicate },
    { status: result.duplicate ? 200 : 201, headers: { "cache-control": "no-store" } },
  );
});
