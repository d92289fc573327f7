import "server-only";
import Stripe from "stripe";
import { env } from "./env";

const g = globalThis as unknown as { bandedgeStripe?: Stripe };

// The one Stripe client. Production sets only the real key; development and tests also set STRIPE_API_BASE,
// which points the same SDK at the local stand-in.
export function stripe(): Stripe {
  if (!g.bandedgeStripe) {
    const e = env();
    const base = e.STRIPE_API_BASE ? new URL(e.STRIPE_API_BASE) : null;
    g.bandedgeStripe = new Stripe(e.STRIPE_SECRET_KEY, {
      // A slow processor must not hold a customer's request (and a database connection) for long.
      timeout: 10_000,
      maxNetworkRetries: 1,
      ...(base
        ? {
            host: base.hostname,
            port: base.port || (base.protocol === "https:" ? 443 : 80),
            protocol: base.protocol === "https:" ? "https" : "http",
          }
        : {}),
    });
  }
  return g.bandedgeStripe;
}

export type { Stripe };
