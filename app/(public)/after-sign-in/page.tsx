import { redirect } from "next/navigation";
import { homeFor } from "@/lib/engine/permissions";
import { requireViewer } from "@/lib/server/session";

// Sends each person to their own part of the site after signing in.
export default async function AfterSignInPage() {
  const viewer = await requireViewer();
  redirect(homeFor(viewer.role));
}
