"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

// The sign-in library's client is loaded when someone signs out, not with every page that shows the button.
export function SignOutButton() {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <button
      type="button"
      className="rounded-card border border-dial-deep px-3 py-1 text-dial hover:bg-bakelite-soft"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        try {
          const { authClient } = await import("@/lib/client/auth-client");
          await authClient.signOut();
        } catch {
          // No connection: the button comes back so the person can try again.
          setBusy(false);
          return;
        }
        router.push("/");
        router.refresh();
      }}
    >
      Sign out
    </button>
  );
}
