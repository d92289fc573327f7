import type Stripe from "stripe";
import { json } from "@/lib/server/route-handler";
import { env } from "@/lib/server/env";
import { stripe } from "@/lib/server/payments";
import { expireStaleCheckouts, handleStripeEvent } from "@/lib/server/services/payments";

export const dynamic = "force-dynamic";

const MAX_BYTES = 512 * 1024;

// The one state-changing route without the Origin check: the processor calls it, and the signature over the
// raw body (checked by the SDK, 300 s tolerance) is what proves the sender.
export async function POST(request: Request): Promise<Response> {
  const length = Number(request.headers.get("content-length") ?? 0);
  if (length > MAX_BYTES) return json({ error: { code: "payload_too_large", message: "Too large." } }, { status: 413 });
  const payload = await request.text();
  if (payload.length > MAX_BYTES) return json({ error: { code: "payload_too_large", message: "Too large." } }, { status: 413 });
  const signature = request.headers.get("stripe-signature");
  if (!signature) return json({ error: { code: "invalid_signature", message: "Missing signature." } }, { status: 400 });

  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(payload, signature, env().STRIPE_WEBHOOK_SECRET);
  } catch {
    return json({ error: { code: "invalid_signature", message: "The signature does not match." } }, { status: 400 });
  }

  try {
    const { outcome, paidJobId } = await handleStripeEvent(event);
    // Once money is in, any other open checkout of the job asks for an amount that is no longer right.
    if (paidJobId) await expireStaleCheckouts(paidJobId).catch((e: unknown) => console.error("[bandedge] expiring checkouts failed", e));
    return json({ received: true, outcome });
  } catch (error) {
    // Not handled yet: a non-2xx makes the processor deliver again later.
    console.error("[bandedge] webhook not applied; the processor will retry", event.id, error);
    return json({ error: { code: "retry", message: "Not applied; deliver again later." } }, { status: 503 });
  }
}
