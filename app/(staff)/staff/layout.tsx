import type { ReactNode } from "react";
import { AreaShell } from "@/components/area-shell";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";
import { withUnreadCount } from "@/lib/server/services/notifications";

// Each staff member's own pages, whatever their role: what happened for them, and how they want to hear of it.
export default async function StaffLayout({ children }: { children: ReactNode }) {
  const viewer = await requirePermission("notifications.use", "/staff/notifications");
  return (
    <AreaShell
      viewer={await withUnreadCount(viewer)}
      timeZone={await shopTimeZone()}
      title="My profile"
      nav={[
        { href: "/staff/notifications", label: "Notifications" },
        { href: "/staff/profile", label: "Profile & notification choices" },
      ]}
    >
      {children}
    </AreaShell>
  );
}
