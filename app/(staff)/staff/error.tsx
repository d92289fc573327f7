"use client";

import { AreaError } from "@/components/area-error";

export default function Error({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <AreaError
      error={error}
      reset={reset}
      links={[
        { href: "/staff/notifications", label: "Notifications" },
        { href: "/", label: "Home page" },
      ]}
    />
  );
}
