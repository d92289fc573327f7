import type { Metadata } from "next";
import { SiteFooter, SiteHeader } from "@/components/site-header";
import { StatusPage, type StatusLink } from "@/components/status-page";
import { homeFor } from "@/lib/engine/permissions";
import { getViewer } from "@/lib/server/session";

export const metadata: Metadata = { title: "Page not found" };

const AREA_LABEL: Record<string, string> = { "/portal": "Back to my sets", "/bench": "Back to the bench", "/office": "Back to the office" };

// Unknown addresses, and pages of an area the signed-in person has no part in, end here: one answer for
// both, so a page's existence is not given away, with a way back for everyone.
export default async function NotFound() {
  const viewer = await getViewer();
  const links: StatusLink[] = viewer
    ? [
        { href: homeFor(viewer.role), label: AREA_LABEL[homeFor(viewer.role)] ?? "Back" },
        { href: "/", label: "Home page" },
      ]
    : [
        { href: "/", label: "Home page" },
        { href: "/sign-in", label: "Sign in" },
      ];
  links.push({ href: "/verify", label: "Check a certificate" });
  return (
    <>
      <SiteHeader viewer={viewer} />
      <main id="main" className="mx-auto max-w-page px-4 py-8">
        <StatusPage code="404" title="This page is not on our dial" links={links}>
          <p>The address may be mistyped or out of date, or the page belongs to another account or to the workshop.</p>
          {!viewer && <p>If you were following your set or a link from one of our e-mails, sign in first and try the link again.</p>}
        </StatusPage>
      </main>
      <SiteFooter />
    </>
  );
}
