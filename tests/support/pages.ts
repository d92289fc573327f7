import type { Page } from "playwright-core";
import { DEMO } from "./accounts";

// Every page in its main state, per audience. Pages with ids are reached by following the first link of a list.
export const AUDIENCES: {
  who: string;
  login?: { email: string; password: string };
  pages: string[];
  follow?: Follow[];
  certificatePage?: boolean;
}[] = [
  { who: "anonymous", pages: ["/", "/sign-in", "/sign-up", "/reset-password", "/welcome", "/verify", "/mailbox"], certificatePage: true },
  {
    who: "set owner",
    login: DEMO.customer,
    pages: ["/portal", "/portal/request", "/portal/claims", "/portal/account"],
    follow: [
      { from: "/portal", link: /Aurelian/ },
      { from: "/portal", link: /Haldane/ },
      { from: "/portal/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "technician",
    login: DEMO.tech,
    pages: ["/bench", "/bench/intake", "/bench/calculator", "/bench/claims", "/staff/notifications", "/staff/profile"],
    follow: [
      // The queue's first page fills up with the jobs other tests create: these two are searched for.
      { from: "/bench", search: "KL-0008", link: /KL-0008/ },
      { from: "/bench", search: "KL-0002", link: /KL-0002/ },
      { from: "/bench/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "shop owner",
    login: DEMO.owner,
    pages: [
      "/office",
      "/office/staff",
      "/office/instruments",
      "/office/settings",
      "/office/payments",
      "/office/certificates",
      "/office/audit",
      "/office/reports",
      "/office/parts",
      "/staff/notifications",
    ],
    follow: [{ from: "/office/payments", link: /KL-/ }],
  },
];

export type Audience = (typeof AUDIENCES)[number];

/** A page reached from a list: open the list, search it when asked, and take the first matching link's address. */
export type Follow = { from: string; link: RegExp; search?: string };

export async function followedAddress(page: Page, f: Follow): Promise<string> {
  await page.goto(f.from);
  if (f.search) await page.getByLabel("Search", { exact: true }).fill(f.search);
  const link = page.getByRole("link", { name: f.link }).first();
  await link.waitFor({ timeout: 15_000 });
  const href = await link.getAttribute("href");
  if (!href) throw new Error(`no link matching ${f.link} on ${f.from}`);
  return href;
}
