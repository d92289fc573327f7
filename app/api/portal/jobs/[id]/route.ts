import { route } from "@/lib/api";
import { getPortalJobView } from "@/lib/services/portal-view";
import { idFrom } from "../../_lib/ids";

// GET /api/portal/jobs/:id — timeline, photos, current estimate, payments and what is due.
export const GET = route<{ id: string }>({ permission: "portal.use" }, async ({ viewer, params }) => {
  return getPortalJobView({ jobId: idFrom(params.id), customerId: viewer.id });
});
