"use client";

import { useEffect } from "react";
import { StatusPage, type StatusLink } from "./status-page";

/** What an area shows when a page fails on our side: no stack trace, a way to try again and ways out. */
export function AreaError({ error, reset, links }: { error: Error & { digest?: string }; reset: () => void; links: StatusLink[] }) {
  useEffect(() => {
    // The server logged the cause under this digest; the browser console gets the same reference only.
    if (error.digest) console.warn(`Page failed; reference ${error.digest}`);
  }, [error.digest]);
  return (
    <StatusPage
      title="Something went wrong on our side"
      links={links}
      action={
        <button type="button" className="btn-primary" onClick={reset}>
          Try again
        </button>
      }
    >
      <p>
        Nothing you entered was lost: what had been saved is still saved. Try again in a moment; if it keeps happening, call or write to the
        workshop.
      </p>
      {error.digest && (
        <p className="text-sm">
          Reference for the workshop: <span className="font-mono">{error.digest}</span>
        </p>
      )}
    </StatusPage>
  );
}
