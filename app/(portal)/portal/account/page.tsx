import type { Metadata } from "next";
import { requirePermission } from "@/lib/server/session";
import { getOwnerAccount } from "@/lib/server/services/owner-account";
import { AccountView } from "./_components/account-view";

export const metadata: Metadata = { title: "My account" };

export default async function AccountPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const viewer = await requirePermission("account.manage", "/portal/account");
  const [initial, params] = await Promise.all([getOwnerAccount({ ownerId: viewer.id }), searchParams]);
  return <AccountView initial={initial} emailChanged={params.email === "changed"} />;
}
