import { AppError } from "@/lib/server/errors";
import { route, zodFields } from "@/lib/server/route-handler";
import { searchCustomers } from "@/lib/server/services/intake";
import { customerSearchSchema } from "@/lib/validation/intake";

// GET /api/bench/customers?q=holloway — set owners by name, e-mail or phone, for counter and phone intake.
export const GET = route({ permission: "job.intake" }, async ({ request }) => {
  const parsed = customerSearchSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
  return { customers: await searchCustomers(parsed.data) };
});
