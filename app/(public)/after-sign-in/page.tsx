import { redirect } from "next/navigation";
import { homeFor } from "@/lib/permissions";
import { requireViewer } from "@/lib/session";

// Sends each person to their own part of the site after signing in.
export default async function AfterSignInPage() {
  const viewer = await requireViewer();
  redirect(homeFor(viewer.role));
}
