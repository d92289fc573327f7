import Link from "next/link";
import type { ReactNode } from "react";
import { Providers } from "./providers";
import { SiteFooter, SiteHeader, type HeaderViewer } from "./site-header";

// The signed-in areas fetch their data through the query client; public pages ship without it.
export function AreaShell({
  viewer,
  title,
  nav,
  children,
  dense,
}: {
  viewer: HeaderViewer;
  title: string;
  nav: { href: string; label: string }[];
  children: ReactNode;
  dense?: boolean;
}) {
  return (
    <>
      <SiteHeader viewer={viewer} />
      <div className="border-b border-dial-rule bg-dial-deep">
        <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-5 gap-y-1 px-4 py-2 text-sm">
          <span className="font-serif font-bold">{title}</span>
          <nav aria-label={`${title} sections`} className="flex flex-wrap gap-x-4 gap-y-1">
            {nav.map((n) => (
              <Link key={n.href} href={n.href} className="text-bakelite no-underline hover:text-ember-dark hover:underline">
                {n.label}
              </Link>
            ))}
          </nav>
        </div>
      </div>
      <main id="main" className={`mx-auto max-w-page px-4 ${dense ? "py-4" : "py-8"}`}>
        <Providers>{children}</Providers>
      </main>
      <SiteFooter />
    </>
  );
}
