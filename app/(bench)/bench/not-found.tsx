import { StatusPage } from "@/components/status-page";

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="We could not find that"
      links={[
        { href: "/bench", label: "Queue" },
        { href: "/bench/claims", label: "Claims" },
        { href: "/", label: "Home page" },
      ]}
    >
      <p>The job, claim or certificate may have been removed, or the number mistyped.</p>
    </StatusPage>
  );
}
