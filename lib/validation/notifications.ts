import { z } from "@/lib/engine/zod";
import "./field-words";
import { NOTIFICATION_KINDS, type NotificationKind } from "@/lib/engine/notifications";

// A person's notification choices, shared by the profile form and the server: every kind, both channels.

const channel = z.object({
  inApp: z.boolean({ message: "In the app: tick or clear the box." }),
  email: z.boolean({ message: "By e-mail: tick or clear the box." }),
});

export const notificationPreferencesSchema = z.object({
  preferences: z.object(Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, channel])) as Record<NotificationKind, typeof channel>),
});
export type NotificationPreferencesInput = z.infer<typeof notificationPreferencesSchema>;

export const markNotificationSchema = z.object({
  read: z.boolean({ message: "Read: say true to mark it read or false to mark it unread." }),
});
