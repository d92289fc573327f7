import type { ReactNode } from "react";
import { SiteFooter, SiteHeader } from "@/components/site-header";

export default function PublicLayout({ children }: { children: ReactNode }) {
  return (
    <>
      <SiteHeader />
      <main id="main" className="mx-auto max-w-page px-4 py-8">
        {children}
      </main>
      <SiteFooter />
    </>
  );
}
