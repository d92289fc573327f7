import type { Metadata } from "next";
import { PartsCatalogue } from "@/components/office/parts-catalogue";
import { requirePermission } from "@/lib/server/session";
import { listParts } from "@/lib/server/services/parts";
import { getShop } from "@/lib/server/services/shop";

export const metadata: Metadata = { title: "Parts" };

export default async function PartsPage() {
  await requirePermission("parts.manage", "/office/parts");
  const [parts, shop] = await Promise.all([listParts(), getShop()]);
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-3xl font-bold">Parts</h1>
        <p className="max-w-prose text-bakelite-soft">
          The shop&apos;s parts catalogue: what each part costs the shop and the markup on it. The bench finds parts here when it builds an
          estimate, and each estimate keeps the price it was built with, so changing a cost here never changes an estimate already sent. A
          part used on an estimate is retired rather than removed: it is no longer offered, and estimates that have it keep showing it.
          Stock counts are optional; an approved estimate takes its parts from the count, and a job cancelled before the bench gives them
          back.
        </p>
      </div>
      <PartsCatalogue initial={parts} currency={shop.policy.currency} defaultMarkupBp={shop.policy.parts.defaultMarkupBp} />
    </div>
  );
}
