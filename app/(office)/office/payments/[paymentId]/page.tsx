import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "@/lib/engine/zod";
import { jsonify } from "@/components/office/format";
import { RefundPanel } from "@/components/office/refund-panel";
import { VoidPaymentForm } from "@/components/office/void-payment-form";
import { getPaymentForOffice } from "@/db/queries/office";
import { jobNumber } from "@/lib/engine/jobs/states";
import { getShop } from "@/lib/server/services/shop";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Payment" };

export default async function PaymentPage({ params }: { params: Promise<{ paymentId: string }> }) {
  const { paymentId } = await params;
  await requirePermission("payment.refund", `/office/payments/${paymentId}`);
  if (!z.uuid().safeParse(paymentId).success) notFound();
  const [payment, shop] = await Promise.all([getPaymentForOffice({ paymentId }), getShop()]);
  if (!payment) notFound();
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/office/payments">← All payments</Link>
      </p>
      <h1 className="text-3xl font-bold">
        Payment for <span className="figure">{jobNumber(payment.jobNumber)}</span>
      </h1>
      <RefundPanel initial={jsonify(payment)} currency={shop.policy.currency} />
      {payment.method !== "card" && payment.status === "paid" ? <VoidPaymentForm paymentId={payment.id} /> : null}
    </div>
  );
}
