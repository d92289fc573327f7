import type { ReactNode } from "react";
import { SiteFooter, SiteHeader } from "@/components/site-header";
import { getViewer } from "@/lib/server/session";

export default async function PublicLayout({ children }: { children: ReactNode }) {
  const viewer = await getViewer();
  return (
    <>
      <SiteHeader viewer={viewer} />
      <main id="main" className="mx-auto max-w-page px-4 py-8">
        {children}
      </main>
      <SiteFooter />
    </>
  );
}
