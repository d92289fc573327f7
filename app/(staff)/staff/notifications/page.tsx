import type { Metadata } from "next";
import { NotificationList } from "@/components/staff/notification-list";
import { listNotifications } from "@/lib/server/services/notifications";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Notifications" };

export default async function NotificationsPage() {
  const viewer = await requirePermission("notifications.use", "/staff/notifications");
  const initial = await listNotifications({ userId: viewer.id });
  return <NotificationList initial={initial} />;
}
