"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import { TableScroll } from "@/components/ui/table-scroll";
import type { listFailedEmailsForOffice } from "@/db/queries/office";
import { officeFetch } from "@/lib/client/office-api";
import { formatWhen, type Jsonify } from "./format";
import { useShopTimeZone } from "@/components/shop-time-zone";

export type FailedMail = Jsonify<Awaited<ReturnType<typeof listFailedEmailsForOffice>>[number]>;

// E-mail that could not be sent, with why, and a button that puts each back in the queue.
export function FailedMailList({ rows }: { rows: FailedMail[] }) {
  const timeZone = useShopTimeZone();
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string } | null>(null);

  async function resend(row: FailedMail) {
    setBusy(row.id);
    setOutcome(null);
    try {
      await officeFetch(`/api/office/emails/${row.id}/resend`, { method: "POST" });
      setOutcome({ tone: "success", text: `The message to ${row.toAddress} is queued again.` });
      router.refresh();
    } catch (e) {
      setOutcome({ tone: "error", text: e instanceof Error ? e.message : "It could not be queued again; try once more." });
    } finally {
      setBusy(null);
    }
  }

  const notice = outcome ? (
    <Notice tone={outcome.tone} live>
      <p>{outcome.text}</p>
    </Notice>
  ) : null;
  // The answer stays in view when the message just re-queued was the last one listed.
  if (rows.length === 0)
    return (
      <div className="space-y-3">
        {notice}
        <p className="text-sm text-bakelite-soft">Every e-mail has gone out or is on its way.</p>
      </div>
    );
  return (
    <div className="space-y-3">
      <TableScroll label="E-mail that could not be sent">
        <table className="dense-table">
          <thead>
            <tr>
              <th scope="col">Queued</th>
              <th scope="col">To</th>
              <th scope="col">Message</th>
              <th scope="col">Why it failed</th>
              <th scope="col">
                <span className="sr-only">Action</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <td className="figure whitespace-nowrap">{formatWhen(r.createdAt, timeZone)}</td>
                <td className="break-all">{r.toAddress}</td>
                <td>{r.template}</td>
                <td className="max-w-sm whitespace-pre-wrap break-words">
                  <span aria-hidden="true">✕ </span>
                  {r.lastError ?? "No reason recorded"} ({r.attempts} {r.attempts === 1 ? "try" : "tries"})
                </td>
                <td>
                  <button
                    type="button"
                    className="btn-secondary whitespace-nowrap text-sm"
                    disabled={busy !== null}
                    onClick={() => void resend(r)}
                    aria-label={`Send again to ${r.toAddress}`}
                  >
                    {busy === r.id ? "Queuing…" : "Send again"}
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>
      {notice}
    </div>
  );
}
