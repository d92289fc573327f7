import { route } from "@/lib/server/route-handler";
import { markAllNotificationsRead } from "@/lib/server/services/notifications";

// POST /api/staff/notifications/read-all — marks every one of the person's own notifications read.
export const POST = route({ permission: "notifications.use" }, async ({ viewer }) => markAllNotificationsRead({ userId: viewer.id }));
