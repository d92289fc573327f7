import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getJobForCustomer } from "@/db/queries/jobs";
import { requirePermission } from "@/lib/server/session";
import { PaymentReturn } from "./payment-return";

export const metadata: Metadata = { title: "Confirming your payment" };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// Where the payment page sends the payer back. It never records anything: only the verified webhook does.
export default async function PaymentReturnPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { id } = await params;
  const viewer = await requirePermission("portal.use", `/portal/jobs/${id}`);
  if (!UUID.test(id) || !(await getJobForCustomer({ jobId: id, customerId: viewer.id }))) notFound();
  const sp = await searchParams;
  const sessionId = typeof sp.session_id === "string" && /^cs_[A-Za-z0-9_]{1,200}$/.test(sp.session_id) ? sp.session_id : null;
  const paymentId = typeof sp.payment === "string" && UUID.test(sp.payment) ? sp.payment : null;
  return <PaymentReturn jobId={id} sessionId={sessionId} paymentId={paymentId} />;
}
