import { StatusPage } from "@/components/status-page";

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="We could not find that"
      links={[
        { href: "/portal", label: "My jobs" },
        { href: "/portal/claims", label: "Warranty claims" },
        { href: "/", label: "Home page" },
      ]}
    >
      <p>It may have been withdrawn, or belong to another account.</p>
    </StatusPage>
  );
}
