import { StatusPage } from "@/components/status-page";

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="We could not find that"
      links={[
        { href: "/staff/notifications", label: "Notifications" },
        { href: "/", label: "Home page" },
      ]}
    >
      <p>The page may have moved, or the address was mistyped.</p>
    </StatusPage>
  );
}
