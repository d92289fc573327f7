import { reportsForOwner, resolveMonthRange } from "@/db/queries/reports";
import { route, zodFields } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { reportRangeSchema } from "@/lib/validation/office";

export const GET = route({ permission: "reports.read" }, async ({ request }) => {
  const q = reportRangeSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!q.success) throw new AppError("invalid_input", "Some filters need attention.", zodFields(q.error));
  return reportsForOwner(resolveMonthRange(q.data));
});
