import type { Metadata } from "next";
import { NotificationPreferencesForm } from "@/components/staff/notification-preferences-form";
import { ROLE_LABEL } from "@/lib/engine/permissions";
import { getNotificationPreferences } from "@/lib/server/services/notifications";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "My profile" };

export default async function StaffProfilePage() {
  const viewer = await requirePermission("notifications.use", "/staff/profile");
  const preferences = await getNotificationPreferences({ userId: viewer.id });
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-2xl font-bold">My profile</h1>
        <dl className="mt-3 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
          <dt className="font-semibold">Name</dt>
          <dd className="break-words">{viewer.name}</dd>
          <dt className="font-semibold">E-mail</dt>
          <dd className="break-all">{viewer.email}</dd>
          <dt className="font-semibold">Role</dt>
          <dd>{ROLE_LABEL[viewer.role]}</dd>
        </dl>
        <p className="mt-2 text-sm text-bakelite-soft">The shop owner changes names, roles and access under Office → Staff.</p>
      </div>
      <NotificationPreferencesForm initial={preferences} />
    </div>
  );
}
