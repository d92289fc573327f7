import { json, readJson, route } from "@/lib/server/route-handler";
import { getShop } from "@/lib/server/services/shop";
import { dialFitRequestSchema, invalidInputBody, runDialFitTool } from "@/lib/engine/requests";

// POST /api/tools/dial-fit — the dial-calibration fit (see lib/engine/requests/dial-fit-request.ts for the contract),
// judged against the shop's dial tolerance for the band kind.
export const POST = route({ permission: "tools.use" }, async ({ request }) => {
  const { policy } = await getShop();
  try {
    return runDialFitTool(dialFitRequestSchema.parse(await readJson(request)), policy.tolerances);
  } catch (e) {
    const bad = invalidInputBody(e);
    if (bad) return json(bad, { status: 400 });
    throw e;
  }
});
