import { transaction } from "@/db/transaction";
import { route } from "@/lib/api";
import { postMessage } from "@/lib/services/messages";
import { getPortalMessages } from "@/lib/services/portal-view";
import { messageSchema } from "@/lib/validation/quote";
import { idFrom } from "../../../_lib/ids";

// GET /api/portal/jobs/:id/messages — the thread as the owner sees it (no internal notes).
export const GET = route<{ id: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  return { messages: await getPortalMessages({ jobId: idFrom(params.id), customerId: viewer.id }) };
});

// POST /api/portal/jobs/:id/messages { body }
export const POST = route<{ id: string }, typeof messageSchema>({ permission: "portal.use", body: messageSchema }, async ({ viewer, params, body }) => {
  const jobId = idFrom(params.id);
  const row = await transaction((ctx) => postMessage(ctx, { jobId, author: { id: viewer.id, side: "customer" }, body: body.body }));
  return Response.json({ id: row.id }, { status: 201, headers: { "cache-control": "no-store" } });
});
