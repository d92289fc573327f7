import { json, readJson, route } from "@/lib/server/route-handler";
import { alignmentRequestSchema, invalidInputBody, runAlignmentTool } from "@/lib/engine/requests";

// POST /api/tools/alignment — the alignment calculator (see lib/engine/requests/alignment-request.ts for the contract).
export const POST = route({ permission: "tools.use" }, async ({ request }) => {
  try {
    return runAlignmentTool(alignmentRequestSchema.parse(await readJson(request)));
  } catch (e) {
    const bad = invalidInputBody(e);
    if (bad) return json(bad, { status: 400 });
    throw e;
  }
});
