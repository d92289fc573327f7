import { z } from "@/lib/engine/zod";
import { AppError } from "@/lib/server/errors";
import { route, zodFields } from "@/lib/server/route-handler";
import { createPart, listParts } from "@/lib/server/services/parts";
import { partFormSchema } from "@/lib/validation/parts";

const listQuery = z.object({
  q: z.string().trim().max(80, "Search: keep it under 80 characters.").default(""),
  show: z.enum(["active", "retired", "all"], { error: "Show: active, retired or all." }).default("active"),
});

// GET /api/office/parts?q=cord&show=all — the catalogue as the office keeps it (others get 404).
export const GET = route({ permission: "parts.manage" }, async ({ request }) => {
  const parsed = listQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
  return { parts: await listParts(parsed.data) };
});

// A new part: its name as printed on estimates, an optional supplier reference, cost, markup and stock count.
export const POST = route({ permission: "parts.manage", body: partFormSchema }, async ({ body, viewer }) => {
  const part = await createPart({ input: body, actorId: viewer.id });
  return { part };
});
