import { route } from "@/lib/server/route-handler";
import { getPortalJobView } from "@/lib/server/services/portal-view";
import { idFrom } from "../../_lib/ids";

// GET /api/portal/jobs/:id — timeline, photos, current estimate, payments and what is due.
export const GET = route<{ id: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  return getPortalJobView({ jobId: idFrom(params.id), customerId: viewer.id });
});
