import { listAuditEventsForOwner } from "@/db/queries/audit";
import { route, zodFields } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { auditFilterSchema } from "@/lib/validation/office";

export const GET = route({ permission: "audit.read" }, async ({ request }) => {
  const q = auditFilterSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!q.success) throw new AppError("invalid_input", "Some filters need attention.", zodFields(q.error));
  return listAuditEventsForOwner({ filter: q.data });
});
