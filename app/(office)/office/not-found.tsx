import { StatusPage } from "@/components/status-page";

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="We could not find that"
      links={[
        { href: "/office", label: "Office overview" },
        { href: "/office/payments", label: "Payments" },
        { href: "/", label: "Home page" },
      ]}
    >
      <p>The payment, certificate or record may not exist, or the number was mistyped.</p>
    </StatusPage>
  );
}
