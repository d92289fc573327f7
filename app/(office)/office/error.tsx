"use client";

import { AreaError } from "@/components/area-error";

export default function Error({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <AreaError
      error={error}
      reset={reset}
      links={[
        { href: "/office", label: "Office overview" },
        { href: "/", label: "Home page" },
      ]}
    />
  );
}
