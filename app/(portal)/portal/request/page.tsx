import type { Metadata } from "next";
import { requirePermission } from "@/lib/server/session";
import { QuoteForm } from "./_components/quote-form";

export const metadata: Metadata = { title: "Request a quote" };

export default async function RequestQuotePage() {
  await requirePermission("quote.request", "/portal/request");
  return (
    <div className="mx-auto max-w-prose space-y-8">
      <header className="space-y-2">
        <h1 className="text-3xl font-bold">Request a quote</h1>
        <p className="text-lg text-bakelite-soft">
          Tell us about your set and send a few photos. A technician reads every request and replies with a written estimate, usually within
          three working days. You decide only after you have seen it.
        </p>
      </header>
      <QuoteForm />
    </div>
  );
}
