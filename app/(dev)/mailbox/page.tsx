import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { SiteHeader } from "@/components/site-header";
import { getViewer } from "@/lib/server/session";
import { env } from "@/lib/server/env";
import { formatDateTime } from "@/lib/engine/dates";
import { shopTimeZone } from "@/lib/server/services/shop";

export const metadata: Metadata = { title: "Mailbox (development)", robots: { index: false } };
export const dynamic = "force-dynamic";

type Message = { id: string; from: string; to: string[]; subject: string; html: string; createdAt: string };

// Local demo only: what the local mail stand-in received, sign-in links included, for anyone who opens it.
// It exists only in the local-demo mode (which listens on loopback only); anywhere else it is not found.
export default async function MailboxPage({ searchParams }: { searchParams: Promise<{ to?: string; id?: string }> }) {
  const base = env().MAILBOX_URL;
  if (!env().BANDEDGE_LOCAL_DEMO || !base) notFound();
  const { to, id } = await searchParams;
  const url = new URL("/messages", base);
  if (to) url.searchParams.set("to", to);
  let messages: Message[] = [];
  let problem: string | null = null;
  try {
    const res = await fetch(url, { cache: "no-store" });
    messages = ((await res.json()) as { data: Message[] }).data;
  } catch {
    problem = "The local mail stand-in is not answering.";
  }
  const open = messages.find((m) => m.id === id) ?? messages[0];
  const timeZone = await shopTimeZone();
  return (
    <>
      <SiteHeader viewer={await getViewer()} />
      <main id="main" className="mx-auto max-w-page space-y-4 px-4 py-6">
        <div>
          <h1 className="text-2xl font-bold">Mailbox</h1>
          <p className="text-sm text-bakelite-soft">Development only: every message the local mail stand-in received, newest first.</p>
        </div>
        <form className="flex gap-2" action="/mailbox">
          <label htmlFor="to" className="sr-only">
            Filter by recipient
          </label>
          <input id="to" name="to" defaultValue={to} placeholder="Filter by recipient" className="field-input mt-0 max-w-xs" />
          <button className="btn-secondary" type="submit">
            Filter
          </button>
        </form>
        {problem ? <p className="text-fail">{problem}</p> : null}
        <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
          <ul className="card max-h-[70vh] divide-y divide-dial-rule overflow-y-auto" aria-label="Messages">
            {messages.length === 0 ? <li className="p-3 text-sm">No messages yet.</li> : null}
            {messages.map((m) => (
              <li key={m.id} className={m.id === open?.id ? "bg-dial-deep" : ""}>
                <a
                  href={`/mailbox?${new URLSearchParams({ ...(to ? { to } : {}), id: m.id })}`}
                  className="block p-3 text-sm text-bakelite no-underline"
                >
                  <span className="block font-semibold">{m.subject}</span>
                  <span className="block text-bakelite-muted">to {m.to.join(", ")}</span>
                  <span className="figure block text-xs text-bakelite-muted">
                    {formatDateTime(m.createdAt, { timeZone, style: "compact", showZone: true })}
                  </span>
                </a>
              </li>
            ))}
          </ul>
          {open ? (
            <article className="card p-3" aria-label="Open message">
              <p className="text-sm">
                <strong>{open.subject}</strong> — from {open.from} to {open.to.join(", ")}
              </p>
              <iframe
                title={`Message: ${open.subject}`}
                sandbox="allow-popups allow-top-navigation-by-user-activation"
                srcDoc={open.html}
                className="mt-2 h-[60vh] w-full rounded-card border border-dial-rule bg-white"
              />
            </article>
          ) : null}
        </div>
      </main>
    </>
  );
}
