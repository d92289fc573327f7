"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import { formatWhen } from "@/components/office/format";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { officeFetch } from "@/lib/client/office-api";
import { announceUnread, staffKeys } from "@/lib/client/staff-query-keys";
import type { NotificationItem } from "@/lib/server/services/notifications";

type ListData = { items: NotificationItem[]; unread: number };

// The person's own notifications: unread first in weight and words, each leading to its job or claim.
export function NotificationList({ initial }: { initial: ListData }) {
  const timeZone = useShopTimeZone();
  const client = useQueryClient();
  const [show, setShow] = useState<"all" | "unread">("all");
  const { data = initial } = useQuery({
    queryKey: staffKeys.notifications(),
    queryFn: () => officeFetch<ListData>("/api/staff/notifications"),
    initialData: initial,
  });

  const mark = useMutation({
    mutationFn: ({ id, read }: { id: string; read: boolean }) =>
      officeFetch<{ id: string; read: boolean; unread: number }>(`/api/staff/notifications/${id}/read`, {
        method: "POST",
        json: { read },
      }),
    onSuccess: (r) => {
      client.setQueryData<ListData>(staffKeys.notifications(), (old) =>
        old ? { unread: r.unread, items: old.items.map((n) => (n.id === r.id ? { ...n, read: r.read } : n)) } : old,
      );
      announceUnread(r.unread);
    },
  });
  const markAll = useMutation({
    mutationFn: () => officeFetch<{ unread: number }>("/api/staff/notifications/read-all", { method: "POST", json: {} }),
    onSuccess: () => {
      client.setQueryData<ListData>(staffKeys.notifications(), (old) =>
        old ? { unread: 0, items: old.items.map((n) => ({ ...n, read: true })) } : old,
      );
      announceUnread(0);
    },
  });

  // Following a link marks it read on the way; keepalive lets the request finish as the page changes.
  const follow = (n: NotificationItem) => {
    if (n.read) return;
    void fetch(`/api/staff/notifications/${n.id}/read`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ read: true }),
      credentials: "same-origin",
      keepalive: true,
    });
    announceUnread(Math.max(0, data.unread - 1));
  };

  const items = show === "unread" ? data.items.filter((n) => !n.read) : data.items;
  const error = mark.error ?? markAll.error;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Notifications</h1>
          <p className="text-sm text-bakelite-soft" aria-live="polite">
            {data.unread === 0 ? "Nothing unread." : data.unread === 1 ? "1 unread." : `${data.unread} unread.`}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <nav aria-label="Which notifications" className="flex gap-3">
            {(["all", "unread"] as const).map((f) => (
              <button
                key={f}
                type="button"
                aria-pressed={show === f}
                onClick={() => setShow(f)}
                className={`underline-offset-2 hover:underline ${show === f ? "font-semibold underline" : ""}`}
              >
                {f === "all" ? "All" : "Unread only"}
              </button>
            ))}
          </nav>
          <button
            type="button"
            onClick={() => markAll.mutate()}
            disabled={data.unread === 0 || markAll.isPending}
            className="btn-secondary px-3 py-1.5"
          >
            Mark all read
          </button>
        </div>
      </div>
      {error ? (
        <Notice tone="error" live>
          {error.message}
        </Notice>
      ) : null}
      {items.length === 0 ? (
        <p className="text-bakelite-soft">{show === "unread" ? "No unread notifications." : "No notifications yet."}</p>
      ) : (
        <ul className="card divide-y divide-dial-rule" data-testid="notification-list">
          {items.map((n) => (
            <li key={n.id} className={`flex flex-col gap-2 p-3 sm:flex-row sm:items-start sm:gap-4 ${n.read ? "" : "bg-dial"}`}>
              <div className="min-w-0 flex-1 space-y-1">
                <p className="flex flex-wrap items-center gap-x-2 text-xs text-bakelite-soft">
                  <span className={n.read ? "" : "font-bold text-ember-dark"}>
                    <span aria-hidden="true">{n.read ? "○" : "●"} </span>
                    {n.read ? "Read" : "Unread"}
                  </span>
                  <span>· {n.kindLabel}</span>
                  <span>· {formatWhen(n.createdAt, timeZone)}</span>
                </p>
                <p className={`break-words ${n.read ? "" : "font-semibold"}`}>
                  <Link href={n.href} onClick={() => follow(n)}>
                    {n.title}
                  </Link>
                </p>
                {n.body ? <p className="text-sm break-words whitespace-pre-line text-bakelite-soft">{n.body}</p> : null}
              </div>
              <button
                type="button"
                onClick={() => mark.mutate({ id: n.id, read: !n.read })}
                disabled={mark.isPending && mark.variables?.id === n.id}
                className="btn-secondary shrink-0 self-start px-3 py-1"
              >
                {n.read ? "Mark unread" : "Mark read"}
                <span className="sr-only">: {n.title}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
