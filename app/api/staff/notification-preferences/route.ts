import { route } from "@/lib/server/route-handler";
import { getNotificationPreferences, saveNotificationPreferences } from "@/lib/server/services/notifications";
import { notificationPreferencesSchema } from "@/lib/validation/notifications";

// GET /api/staff/notification-preferences — the person's choices (defaults where none is stored).
export const GET = route({ permission: "notifications.use" }, async ({ viewer }) => ({
  preferences: await getNotificationPreferences({ userId: viewer.id }),
}));

// PUT /api/staff/notification-preferences { preferences } — every kind, both channels, for oneself only.
export const PUT = route<Record<string, string>, typeof notificationPreferencesSchema>(
  { permission: "notifications.use", body: notificationPreferencesSchema },
  async ({ viewer, body }) => ({ preferences: await saveNotificationPreferences({ userId: viewer.id, preferences: body.preferences }) }),
);
