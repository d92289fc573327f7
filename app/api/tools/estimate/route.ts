import { json, readJson, route } from "@/lib/server/route-handler";
import { getShop } from "@/lib/server/services/shop";
import { checklistCatalogue } from "@/lib/server/services/parts";
import { estimateRequestSchema, invalidInputBody, runEstimateTool } from "@/lib/engine/requests";

// POST /api/tools/estimate — profile → checklist → priced estimate with the shop's policy in force.
export const POST = route({ permission: "tools.use" }, async ({ request }) => {
  const { policy } = await getShop();
  // A figure, not an estimate: a checklist part since retired still prices at its last cost.
  const { catalogue } = await checklistCatalogue(undefined, { includeRetired: true });
  try {
    return runEstimateTool(estimateRequestSchema.parse(await readJson(request)), policy, catalogue);
  } catch (e) {
    const bad = invalidInputBody(e);
    if (bad) return json(bad, { status: 400 });
    throw e;
  }
});
