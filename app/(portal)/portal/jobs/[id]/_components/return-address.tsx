"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import type { OwnerAddress } from "@/lib/server/services/owner-account";
import type { PortalJobView } from "@/lib/server/services/portal-view";
import { api } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

function Lines({ lines }: { lines: string[] }) {
  return (
    <address className="break-words not-italic" data-testid="return-address">
      {lines.map((l, i) => (
        <span key={i} className="block">
          {l}
        </span>
      ))}
    </address>
  );
}

/**
 * Where the set is shipped back. The owner picks one of their addresses (the default preselected); the job
 * keeps a copy, shown here and to the bench that ships it.
 */
export function ReturnAddress({ jobId, job }: { jobId: string; job: PortalJobView["job"] }) {
  const qc = useQueryClient();
  const [changing, setChanging] = useState(false);
  const addresses = useQuery({
    queryKey: [...portalKeys.all, "account", "addresses"],
    queryFn: () => api<{ addresses: OwnerAddress[] }>("/api/portal/account/addresses"),
    enabled: job.canChooseReturnAddress,
  });
  const list = addresses.data?.addresses ?? [];
  const [picked, setPicked] = useState<string | null>(null);
  const selected = picked ?? list.find((a) => a.isDefault)?.id ?? list[0]?.id ?? null;
  const choose = useMutation({
    mutationFn: (addressId: string) => api(`/api/portal/jobs/${jobId}/return-address`, { method: "PUT", body: { addressId } }),
    onSuccess: () => {
      setChanging(false);
      void qc.invalidateQueries({ queryKey: portalKeys.job(jobId) });
    },
  });
  if (!job.returnAddress && !job.canChooseReturnAddress) return null;
  const showPicker = job.canChooseReturnAddress && (changing || !job.returnAddress);
  return (
    <section className="card space-y-3 p-5" aria-labelledby="return-title">
      <h2 id="return-title" className="text-xl font-bold">
        Where we send the set back
      </h2>
      {job.returnAddress ? (
        <>
          <p>{job.state === "returned" ? "The set was shipped to:" : "When the work is done and paid for, we ship the set to:"}</p>
          <Lines lines={job.returnAddress.lines} />
        </>
      ) : (
        <p>Choose the address we ship the set back to. You can change it until the set leaves the shop.</p>
      )}
      {job.returnAddress && job.canChooseReturnAddress && !changing ? (
        <button type="button" className="btn-secondary" onClick={() => setChanging(true)}>
          Choose another address
        </button>
      ) : null}
      {showPicker ? (
        addresses.isPending ? (
          <p>Loading your addresses…</p>
        ) : list.length === 0 ? (
          <p>
            You have no postal address with us yet. <Link href="/portal/account#addresses-title">Add one on your account page</Link>, then
            come back here.
          </p>
        ) : (
          <form
            className="space-y-3"
            onSubmit={(e) => {
              e.preventDefault();
              if (selected) choose.mutate(selected);
            }}
          >
            <fieldset className="space-y-2">
              <legend className="field-label">Ship it back to</legend>
              {list.map((a) => (
                <label key={a.id} className="flex items-start gap-2 rounded-card border border-dial-rule p-2">
                  <input type="radio" name="return-address" className="mt-1" checked={selected === a.id} onChange={() => setPicked(a.id)} />
                  <span className="min-w-0 break-words">
                    {a.lines.join(", ")}
                    {a.isDefault ? <span className="text-bakelite-muted"> (default)</span> : null}
                  </span>
                </label>
              ))}
            </fieldset>
            <div className="flex flex-wrap gap-2">
              <button type="submit" className="btn-primary" disabled={choose.isPending || !selected}>
                {choose.isPending ? "Saving…" : "Ship it back here"}
              </button>
              {changing ? (
                <button type="button" className="btn-secondary" onClick={() => setChanging(false)}>
                  Keep the address above
                </button>
              ) : null}
            </div>
            <p className="text-sm">
              <Link href="/portal/account#addresses-title">Add or edit addresses</Link>
            </p>
          </form>
        )
      ) : null}
      {choose.isError ? (
        <Notice tone="error" live>
          <p>{choose.error.message}</p>
        </Notice>
      ) : null}
    </section>
  );
}
