import { AppError } from "@/lib/server/errors";
import { route, zodFields } from "@/lib/server/route-handler";
import { searchParts } from "@/lib/server/services/parts";
import { partSearchSchema } from "@/lib/validation/parts";

// GET /api/bench/parts?q=cap&limit=8 — the estimate builder's type-ahead: parts still in the catalogue.
export const GET = route({ permission: "estimate.edit" }, async ({ request }) => {
  const parsed = partSearchSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
  return { parts: await searchParts(parsed.data) };
});
