"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import type { ClaimSummary } from "@/lib/server/services/claims";
import { warrantyKeys } from "@/lib/client/warranty-query-keys";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDate } from "@/lib/engine/dates";

async function fetchMyClaims(): Promise<ClaimSummary[]> {
  const res = await fetch("/api/claims", { headers: { accept: "application/json" } });
  if (!res.ok) throw new Error("Your claims could not be loaded.");
  return ((await res.json()) as { claims: ClaimSummary[] }).claims;
}

export function MyClaims({ initial }: { initial: ClaimSummary[] }) {
  const timeZone = useShopTimeZone();
  const { data, error } = useQuery({ queryKey: warrantyKeys.myClaims(), queryFn: fetchMyClaims, initialData: initial });
  if (error) return <p role="alert">{error.message}</p>;
  if (data.length === 0) return <p className="text-bakelite-soft">You have not opened any claims.</p>;
  return (
    <ul className="space-y-2">
      {data.map((c) => (
        <li key={c.id} className="card flex flex-wrap items-center justify-between gap-3 p-4">
          <div>
            <p className="figure text-xs text-bakelite-muted">
              {formatDate(c.createdAt, { timeZone })} · {c.certificateCode}
            </p>
            <Link href={`/portal/claims/${c.id}`} className="font-semibold">
              {c.setName}
            </Link>
          </div>
          <span className="text-sm font-semibold">{c.statusLabel}</span>
        </li>
      ))}
    </ul>
  );
}
