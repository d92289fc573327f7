import { DEMO } from "./accounts";

// Every page in its main state, per audience. Pages with ids are reached by following the first link of a list.
export const AUDIENCES: {
  who: string;
  login?: { email: string; password: string };
  pages: string[];
  follow?: { from: string; link: RegExp }[];
  certificatePage?: boolean;
}[] = [
  { who: "anonymous", pages: ["/", "/sign-in", "/sign-up", "/reset-password", "/welcome", "/verify", "/mailbox"], certificatePage: true },
  {
    who: "set owner",
    login: DEMO.customer,
    pages: ["/portal", "/portal/request", "/portal/claims"],
    follow: [
      { from: "/portal", link: /Aurelian/ },
      { from: "/portal", link: /Haldane/ },
      { from: "/portal/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "technician",
    login: DEMO.tech,
    pages: ["/bench", "/bench/calculator", "/bench/claims"],
    follow: [
      { from: "/bench", link: /KL-0008/ },
      { from: "/bench", link: /KL-0002/ },
      { from: "/bench/claims", link: /KL-|Aurelian|claim/i },
    ],
  },
  {
    who: "shop owner",
    login: DEMO.owner,
    pages: ["/office", "/office/staff", "/office/settings", "/office/payments", "/office/certificates", "/office/audit", "/office/reports"],
    follow: [{ from: "/office/payments", link: /KL-/ }],
  },
];

export type Audience = (typeof AUDIENCES)[number];
