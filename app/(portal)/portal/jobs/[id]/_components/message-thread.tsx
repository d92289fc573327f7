"use client";

import { useMutation, useQuery } from "@tanstack/react-query";
import dynamic from "next/dynamic";
import { useEffect } from "react";
import { Notice } from "@/components/ui/notice";
import type { PortalMessage } from "@/lib/server/services/portal-view";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

// Same height as the form it stands in for, so nothing moves when the form arrives.
function ComposerPlaceholder() {
  return <div className="h-[8.5rem]" aria-hidden="true" />;
}

const MessageComposer = dynamic(() => import("./message-composer"), { ssr: false, loading: ComposerPlaceholder });

export function MessageThread({ jobId }: { jobId: string }) {
  const timeZone = useShopTimeZone();
  const messages = useQuery({
    queryKey: portalKeys.messages(jobId),
    queryFn: () => api<{ messages: PortalMessage[]; unread: number }>(`/api/portal/jobs/${jobId}/messages`),
  });
  // Seeing the thread marks it read up to its newest message; the "New" marks stay for this visit.
  const markRead = useMutation({
    mutationFn: (lastMessageId: string) => api(`/api/portal/jobs/${jobId}/messages/read`, { method: "POST", body: { lastMessageId } }),
  });
  const newest = messages.data?.messages.at(-1);
  const unread = messages.data?.unread ?? 0;
  const { mutate } = markRead;
  useEffect(() => {
    if (newest && unread > 0) mutate(newest.id);
  }, [newest, unread, mutate]);
  return (
    <section aria-labelledby="messages-title" className="space-y-3">
      <h2 id="messages-title" className="text-2xl font-bold">
        Messages with the shop
        {unread > 0 ? (
          <span className="ml-3 rounded-full border border-ember px-2 py-0.5 align-middle text-sm font-semibold text-ember-dark">
            {unread} new
          </span>
        ) : null}
      </h2>
      {messages.isError ? (
        <Notice tone="error">
          <p>{messages.error.message}</p>
        </Notice>
      ) : null}
      {messages.data?.messages.length ? (
        <ol className="space-y-3">
          {messages.data.messages.map((m) => (
            <li
              key={m.id}
              data-unread={m.unread ? "true" : undefined}
              className={`card max-w-prose p-4 ${m.mine ? "ml-auto bg-dial-deep" : ""} ${m.unread ? "border-ember" : ""}`}
            >
              <p className="text-sm font-semibold">
                {m.unread ? <span className="mr-2 rounded border border-ember px-1 text-xs text-ember-dark">New</span> : null}
                {m.from}
                {m.isQuestion ? <span className="ml-2 text-ember-dark">asked a question</span> : null}
                <span className="ml-2 font-normal text-bakelite-muted">{formatDateTime(m.createdAt, { timeZone, showZone: true })}</span>
              </p>
              <p className="mt-1 whitespace-pre-line">{m.body}</p>
              {m.photos.length ? (
                <ul className="mt-2 flex flex-wrap gap-2" aria-label="Photos with this message">
                  {m.photos.map((p) => (
                    <li key={p.id}>
                      <a href={p.url} target="_blank" rel="noreferrer">
                        {/* eslint-disable-next-line @next/next/no-img-element -- photos come re-encoded from our own authorised route; the image optimiser would fetch them without the session */}
                        <img src={p.thumbUrl} alt={p.name} className="h-24 w-24 rounded object-cover" />
                      </a>
                    </li>
                  ))}
                </ul>
              ) : null}
            </li>
          ))}
        </ol>
      ) : messages.isSuccess ? (
        <p className="text-bakelite-muted">No messages yet. Write to the shop any time.</p>
      ) : null}
      <MessageComposer jobId={jobId} />
    </section>
  );
}
