import Link from "next/link";
import type { ReactNode } from "react";
import { Providers } from "./providers";
import { ShopTimeZoneProvider } from "./shop-time-zone";
import { SiteFooter, SiteHeader, type HeaderViewer } from "./site-header";

// The signed-in areas fetch their data through the query client; public pages ship without it.
export function AreaShell({
  viewer,
  title,
  nav,
  children,
  dense,
  timeZone,
}: {
  viewer: HeaderViewer;
  title: string;
  nav: { href: string; label: string }[];
  children: ReactNode;
  dense?: boolean;
  /** The shop's zone, for every date and time the area's client components print. */
  timeZone: string;
}) {
  return (
    <>
      <SiteHeader viewer={viewer} />
      <div className="border-b border-dial-rule bg-dial-deep">
        <div className="mx-auto flex max-w-page items-center gap-x-5 px-4 py-2 text-sm">
          <span className="hidden shrink-0 font-serif font-bold sm:inline">{title}</span>
          {/* On a phone the sections stay on one line and slide sideways inside their own bar. */}
          <nav aria-label={`${title} sections`} className="-my-1 flex min-w-0 gap-x-4 overflow-x-auto py-1 whitespace-nowrap sm:flex-wrap">
            {nav.map((n) => (
              <Link key={n.href} href={n.href} className="text-bakelite no-underline hover:text-ember-dark hover:underline">
                {n.label}
              </Link>
            ))}
          </nav>
        </div>
      </div>
      <main id="main" className={`mx-auto max-w-page px-4 ${dense ? "py-4" : "py-8"}`}>
        <ShopTimeZoneProvider timeZone={timeZone}>
          <Providers>{children}</Providers>
        </ShopTimeZoneProvider>
      </main>
      <SiteFooter />
    </>
  );
}
