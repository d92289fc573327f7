import type { Metadata } from "next";
import { AlignmentCalculator } from "@/components/bench/alignment-calculator";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Alignment calculator" };

export default async function CalculatorPage() {
  await requirePermission("tools.use", "/bench/calculator");
  return (
    <div className="space-y-3">
      <h1 className="text-2xl font-bold">Alignment calculator</h1>
      <p className="max-w-prose text-sm text-bakelite-muted">
        From a band&apos;s printed dial range and the IF: the oscillator range, the images, the capacitance ratios, the tracking points and
        the order of adjustments. Give the tuning gang&apos;s capacitance to solve the padder, trimmers and coils and plot the tracking
        error.
      </p>
      <AlignmentCalculator />
    </div>
  );
}
