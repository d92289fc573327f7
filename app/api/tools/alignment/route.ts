import { json, readJson, route } from "@/lib/api";
import { alignmentRequestSchema, invalidInputBody, runAlignmentTool } from "@/lib/tools";

// POST /api/tools/alignment — the alignment calculator (see lib/tools/alignment-request.ts for the contract).
export const POST = route({ permission: "tools.use" }, async ({ request }) => {
  try {
    return runAlignmentTool(alignmentRequestSchema.parse(await readJson(request)));
  } catch (e) {
    const bad = invalidInputBody(e);
    if (bad) return json(bad, { status: 400 });
    throw e;
  }
});
