import { z } from "@/lib/engine/zod";
import { route } from "@/lib/server/route-handler";
import { markAllNotificationsRead } from "@/lib/server/services/notifications";

// POST /api/staff/notifications/read-all — marks every one of the person's own notifications read. It takes
// no fields: an empty body (or none); anything else is refused rather than silently ignored.
export const POST = route({ permission: "notifications.use", body: z.object({}).strict() }, async ({ viewer }) =>
  markAllNotificationsRead({ userId: viewer.id }),
);
