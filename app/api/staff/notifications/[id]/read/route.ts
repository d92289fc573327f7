import { route } from "@/lib/server/route-handler";
import { markNotification } from "@/lib/server/services/notifications";
import { markNotificationSchema } from "@/lib/validation/notifications";
import { idFrom } from "../../../../portal/_lib/ids";

// POST /api/staff/notifications/:id/read { read } — one's own only; anyone else's answers 404.
export const POST = route<{ id: string }, typeof markNotificationSchema>(
  { permission: "notifications.use", body: markNotificationSchema },
  async ({ viewer, params, body }) => markNotification({ id: idFrom(params.id, "That notification"), userId: viewer.id, read: body.read }),
);
