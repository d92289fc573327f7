"use client";

// Shown when a page fails while rendering (the database stopped answering mid-page, say). The server's
// own message is not sent to the browser, so this says what people can do.
export default function PageError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <h1 className="font-serif text-2xl">This page could not be shown</h1>
      <p className="mt-4">
        Something failed on our side, or the workshop&apos;s records could not be reached. Nothing you sent has been lost. Please try again
        in a minute.
      </p>
      <button type="button" onClick={reset} className="mt-6 rounded border px-4 py-2">
        Try again
      </button>
    </main>
  );
}
