import Link from "next/link";
import type { ReactNode } from "react";

export type StatusLink = { href: string; label: string };

/** A page for when something is not there or went wrong: what happened in words, and ways onward. */
export function StatusPage({
  code,
  title,
  children,
  links,
  action,
}: {
  /** The dial-scale figure at the top: "404", "503", … shown small, never as the only explanation. */
  code?: string;
  title: string;
  children: ReactNode;
  links: StatusLink[];
  action?: ReactNode;
}) {
  return (
    <section className="mx-auto max-w-prose space-y-4 py-6" aria-labelledby="status-title">
      {code && (
        <p className="font-mono text-sm tracking-[0.3em] text-ember" aria-hidden="true">
          {code}
        </p>
      )}
      <h1 id="status-title" className="text-3xl font-bold">
        {title}
      </h1>
      <div className="space-y-2 text-bakelite-soft">{children}</div>
      <div className="flex flex-wrap gap-3 pt-2">
        {action}
        {links.map((l, i) => (
          <Link key={l.href} href={l.href} className={i === 0 && !action ? "btn-primary" : "btn-secondary"}>
            {l.label}
          </Link>
        ))}
      </div>
    </section>
  );
}
