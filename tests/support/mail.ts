import { testEnv } from "./env";

export type ReceivedMail = { id: string; from: string; to: string[]; subject: string; html: string; text: string; createdAt: string };

export async function listMail(to: string): Promise<ReceivedMail[]> {
  const res = await fetch(`${testEnv.mailUrl}/messages?to=${encodeURIComponent(to)}`);
  return ((await res.json()) as { data: ReceivedMail[] }).data;
}

// Waits for a message to `to` whose subject matches; mail goes through the queue, so it takes a moment.
export async function waitForMail(to: string, subject: RegExp | string, { timeoutMs = 20_000, after = 0 } = {}): Promise<ReceivedMail> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const found = (await listMail(to)).find(
      (m) =>
        (typeof subject === "string" ? m.subject.includes(subject) : subject.test(m.subject)) && new Date(m.createdAt).getTime() >= after,
    );
    if (found) return found;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}

export function firstLink(mail: ReceivedMail, contains: string): string {
  const links = [...mail.html.matchAll(/href="([^"]+)"/g)].map((m) => m[1]!.replaceAll("&amp;", "&"));
  const link = links.find((l) => l.includes(contains));
  if (!link) throw new Error(`no link containing ${contains} in "${mail.subject}"`);
  return link;
}
