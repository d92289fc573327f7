"use client";

import "./globals.css";

// The last line of defence, when the root layout itself fails: plain markup in the house colours.
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body className="min-h-screen">
        <main id="main" className="mx-auto max-w-prose space-y-4 px-4 py-12">
          <h1 className="text-3xl font-bold">Something went wrong on our side</h1>
          <p>Nothing you had saved was lost. Try again in a moment; if it keeps happening, call or write to the workshop.</p>
          {error.digest && (
            <p className="text-sm">
              Reference for the workshop: <span className="font-mono">{error.digest}</span>
            </p>
          )}
          <div className="flex flex-wrap gap-3">
            <button type="button" className="btn-primary" onClick={reset}>
              Try again
            </button>
            {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a full reload on purpose: the router itself may be what failed */}
            <a href="/" className="btn-secondary">
              Home page
            </a>
          </div>
        </main>
      </body>
    </html>
  );
}
