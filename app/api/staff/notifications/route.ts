import { route } from "@/lib/server/route-handler";
import { listNotifications } from "@/lib/server/services/notifications";

// GET /api/staff/notifications — the signed-in person's own notifications, newest first, and the unread count.
export const GET = route({ permission: "notifications.use" }, async ({ viewer }) => listNotifications({ userId: viewer.id }));
