import { route } from "@/lib/server/route-handler";
import { unreadCount } from "@/lib/server/services/notifications";

// GET /api/staff/notifications/unread — how many of the person's own notifications are unread (the header's bell).
export const GET = route({ permission: "notifications.use" }, async ({ viewer }) => ({ unread: await unreadCount({ userId: viewer.id }) }));
