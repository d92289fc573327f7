// One query-key factory for a staff member's own notifications and choices.
export const staffKeys = {
  all: ["staff"] as const,
  notifications: () => [...staffKeys.all, "notifications"] as const,
  preferences: () => [...staffKeys.all, "notification-preferences"] as const,
};

/** The header's bell listens for this after the list changes, so its count agrees without a reload. */
export const UNREAD_EVENT = "bandedge:notifications-unread";

export function announceUnread(unread: number): void {
  window.dispatchEvent(new CustomEvent(UNREAD_EVENT, { detail: { unread } }));
}
