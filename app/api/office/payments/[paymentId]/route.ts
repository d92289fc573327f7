import { z } from "@/lib/engine/zod";
import { getPaymentForOffice } from "@/db/queries/office";
import { route } from "@/lib/server/route-handler";
import { notFound } from "@/lib/server/errors";

export const GET = route<{ paymentId: string }>({ permission: "payment.refund" }, async ({ params }) => {
  if (!z.uuid().safeParse(params.paymentId).success) throw notFound("That payment");
  const payment = await getPaymentForOffice({ paymentId: params.paymentId });
  if (!payment) throw notFound("That payment");
  return payment;
});
