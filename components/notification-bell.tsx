"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useState } from "react";
import { UNREAD_EVENT } from "@/lib/client/staff-query-keys";

const POLL_MS = 60_000;

// The staff header's bell: the count of unread notifications, read again on every page and once a minute.
export function NotificationBell({ initialUnread }: { initialUnread?: number }) {
  const [unread, setUnread] = useState<number | null>(initialUnread ?? null);
  const pathname = usePathname();

  useEffect(() => {
    let stopped = false;
    const load = async () => {
      if (document.visibilityState === "hidden") return;
      try {
        const res = await fetch("/api/staff/notifications/unread", { credentials: "same-origin", cache: "no-store" });
        if (!res.ok) return;
        const data = (await res.json()) as { unread: number };
        if (!stopped) setUnread(data.unread);
      } catch {
        // The count waits for the next page or minute; the list itself shows any trouble.
      }
    };
    void load();
    const timer = window.setInterval(load, POLL_MS);
    const onChange = (e: Event) => setUnread((e as CustomEvent<{ unread: number }>).detail.unread);
    window.addEventListener(UNREAD_EVENT, onChange);
    return () => {
      stopped = true;
      window.clearInterval(timer);
      window.removeEventListener(UNREAD_EVENT, onChange);
    };
  }, [pathname]);

  const label = unread === null ? "Notifications" : unread === 0 ? "Notifications, none unread" : `Notifications, ${unread} unread`;
  return (
    <Link
      href="/staff/notifications"
      aria-label={label}
      title={label}
      data-testid="notification-bell"
      className="relative inline-flex h-9 min-w-9 items-center justify-center rounded-card text-dial no-underline hover:bg-walnut hover:text-brass-light"
    >
      <svg aria-hidden="true" width="20" height="20" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="1.8">
        <path d="M6 16V11a6 6 0 1 1 12 0v5l1.5 2h-15L6 16Z" strokeLinejoin="round" />
        <path d="M10 20a2 2 0 0 0 4 0" strokeLinecap="round" />
      </svg>
      {unread ? (
        <span
          aria-hidden="true"
          data-testid="notification-count"
          className="absolute -top-1 -right-1 min-w-5 rounded-full bg-ember px-1 text-center text-xs leading-5 font-bold text-white"
        >
          {unread > 99 ? "99+" : unread}
        </span>
      ) : null}
    </Link>
  );
}
