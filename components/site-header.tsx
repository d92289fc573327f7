import Link from "next/link";
import { canAccess, ROLE_LABEL, type Role } from "@/lib/engine/permissions";
import { NotificationBell } from "./notification-bell";
import { SignOutButton } from "./sign-out-button";

// The dial-scale rule under the brand is our mark: ticks like a tuning scale.
function DialMark() {
  return (
    <svg aria-hidden="true" width="28" height="28" viewBox="0 0 28 28" className="shrink-0">
      <circle cx="14" cy="14" r="13" fill="#2a2320" />
      <path d="M6 17 A9 9 0 0 1 22 17" stroke="#efe4c6" strokeWidth="1.5" fill="none" />
      {[0, 1, 2, 3, 4, 5, 6].map((i) => {
        const a = Math.PI * (1 - i / 6);
        const x1 = 14 + Math.cos(a) * 9;
        const y1 = 17 - Math.sin(a) * 9;
        const x2 = 14 + Math.cos(a) * 7;
        const y2 = 17 - Math.sin(a) * 7;
        return <line key={i} x1={x1} y1={y1} x2={x2} y2={y2} stroke="#efe4c6" strokeWidth="1" />;
      })}
      <line x1="14" y1="17" x2="19" y2="10" stroke="#e0703f" strokeWidth="1.8" strokeLinecap="round" />
    </svg>
  );
}

/**
 * Who is signed in, as the header shows them; the page or layout reads the session. `holdsSets`: a staff
 * account that also holds its own sets is offered both its portal and its staff areas.
 */
export type HeaderViewer = {
  name: string;
  role: Role;
  holdsSets?: boolean;
  /** Staff: unread notifications when the page was drawn (the bell reads it again itself). */
  unreadNotifications?: number;
} | null;

export function SiteHeader({ viewer }: { viewer: HeaderViewer }) {
  // One link per area; each area's own sections are in the bar beneath (AreaShell), never repeated here.
  const links: { href: string; label: string }[] = [];
  if (viewer) {
    if (canAccess(viewer, "portal.use")) links.push({ href: "/portal", label: "My sets" });
    if (canAccess(viewer, "bench.use")) links.push({ href: "/bench", label: "Bench" });
    if (canAccess(viewer, "office.use")) links.push({ href: "/office", label: "Office" });
    if (canAccess(viewer, "notifications.use")) links.push({ href: "/staff/profile", label: "My profile" });
  }
  const staff = viewer !== null && canAccess(viewer, "notifications.use");
  return (
    <header className="border-b-4 border-walnut bg-bakelite text-dial">
      <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
        <Link href="/" className="flex min-w-0 items-center gap-2 text-dial no-underline">
          <DialMark />
          <span className="truncate font-serif text-lg font-bold tracking-wide">
            Kestrel Lane<span className="hidden sm:inline"> Wireless</span>
          </span>
        </Link>
        {links.length > 0 && (
          <nav aria-label="Main" className="order-3 flex w-full items-center gap-4 text-sm sm:order-none sm:w-auto sm:flex-1">
            {links.map((l) => (
              <Link key={l.href} href={l.href} className="text-dial no-underline hover:text-brass-light hover:underline">
                {l.label}
              </Link>
            ))}
          </nav>
        )}
        <div className="ml-auto flex items-center gap-3 text-sm">
          {viewer ? (
            <>
              <span className="hidden text-dial-deep sm:inline">
                {viewer.name} <span className="text-brass-light">· {ROLE_LABEL[viewer.role]}</span>
              </span>
              {staff ? <NotificationBell initialUnread={viewer.unreadNotifications} /> : null}
              <SignOutButton />
            </>
          ) : (
            <>
              <Link href="/sign-in" className="text-dial no-underline hover:underline">
                Sign in
              </Link>
              <Link
                href="/sign-up"
                className="rounded-card bg-ember px-3 py-1.5 font-semibold whitespace-nowrap text-white no-underline hover:bg-ember-dark"
              >
                Request a quote
              </Link>
            </>
          )}
        </div>
      </div>
    </header>
  );
}

export function SiteFooter() {
  return (
    <footer className="mt-16 border-t border-dial-rule bg-dial-deep">
      <div className="mx-auto grid max-w-page gap-4 px-4 py-8 text-sm text-bakelite-soft sm:grid-cols-2">
        <p>Kestrel Lane Wireless · 14 Kestrel Lane, Port Alder · Workshop open Tuesday to Saturday.</p>
        <p className="sm:text-right">
          Mains work on old sets can injure or kill. Our notes are general guidance; follow local codes and licensed practice.
        </p>
      </div>
    </footer>
  );
}
