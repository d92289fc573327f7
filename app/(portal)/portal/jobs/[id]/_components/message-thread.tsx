"use client";

import { useQuery } from "@tanstack/react-query";
import dynamic from "next/dynamic";
import { Notice } from "@/components/ui/notice";
import type { PortalMessage } from "@/lib/server/services/portal-view";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

// Same height as the form it stands in for, so nothing moves when the form arrives.
function ComposerPlaceholder() {
  return <div className="h-[8.5rem]" aria-hidden="true" />;
}

const MessageComposer = dynamic(() => import("./message-composer"), { ssr: false, loading: ComposerPlaceholder });

export function MessageThread({ jobId }: { jobId: string }) {
  const messages = useQuery({
    queryKey: portalKeys.messages(jobId),
    queryFn: () => api<{ messages: PortalMessage[] }>(`/api/portal/jobs/${jobId}/messages`),
  });
  return (
    <section aria-labelledby="messages-title" className="space-y-3">
      <h2 id="messages-title" className="text-2xl font-bold">
        Messages with the shop
      </h2>
      {messages.isError ? (
        <Notice tone="error">
          <p>{messages.error.message}</p>
        </Notice>
      ) : null}
      {messages.data?.messages.length ? (
        <ol className="space-y-3">
          {messages.data.messages.map((m) => (
            <li key={m.id} className={`card max-w-prose p-4 ${m.mine ? "ml-auto bg-dial-deep" : ""}`}>
              <p className="text-sm font-semibold">
                {m.from}
                {m.isQuestion ? <span className="ml-2 text-ember-dark">asked a question</span> : null}
                <span className="ml-2 font-normal text-bakelite-muted">
                  {new Date(m.createdAt).toLocaleString("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" })}
                </span>
              </p>
              <p className="mt-1 whitespace-pre-line">{m.body}</p>
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
