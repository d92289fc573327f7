import { z } from "@/lib/engine/zod";
import { listPaymentsForOffice } from "@/db/queries/office";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";

const querySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  status: z.enum(["paid", "open", "all"]).default("all"),
});

export const GET = route({ permission: "payment.refund" }, async ({ request }) => {
  const q = querySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!q.success) throw new AppError("invalid_input", "The page or status filter is not valid.");
  return listPaymentsForOffice(q.data);
});
