import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { account, certificates, claims, jobs, ownerAddresses, radioSets, session, user, verification } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { formatPostalAddress, isCountryCode, type PostalAddress } from "@/lib/engine/addresses";
import { isTerminal, jobNumber, STATE_LABEL, type JobState } from "@/lib/engine/jobs/states";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { verifyPassword } from "@/lib/server/password";
import type { AddressValues, ProfileValues } from "@/lib/validation/owner-account";

// The set owner's own account: profile, address book, the return address of a job, closing the account.

export type OwnerAddress = PostalAddress & { id: string; isDefault: boolean; lines: string[] };

export const CLOSED_ACCOUNT_NAME = "Closed account";

function toAddress(r: typeof ownerAddresses.$inferSelect): OwnerAddress {
  const a: PostalAddress = {
    recipient: r.recipient,
    line1: r.line1,
    line2: r.line2,
    city: r.city,
    region: r.region,
    postalCode: r.postalCode,
    country: isCountryCode(r.country) ? r.country : "US",
  };
  return { ...a, id: r.id, isDefault: r.isDefault, lines: formatPostalAddress(a) };
}

export async function listAddresses({ ownerId }: { ownerId: string }): Promise<OwnerAddress[]> {
  const rows = await db
    .select()
    .from(ownerAddresses)
    .where(eq(ownerAddresses.ownerId, ownerId))
    .orderBy(desc(ownerAddresses.isDefault), asc(ownerAddresses.createdAt));
  return rows.map(toAddress);
}

/** Jobs not at an end state: closing the account waits for them. */
async function openJobs(tx: TxContext["tx"] | typeof db, ownerId: string) {
  const rows = await tx
    .select({ id: jobs.id, number: jobs.number, state: jobs.state, maker: radioSets.maker, model: radioSets.model })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.customerId, ownerId))
    .orderBy(asc(jobs.number));
  return rows
    .filter((r) => !isTerminal(r.state as JobState))
    .map((r) => ({
      id: r.id,
      number: jobNumber(r.number),
      setName: `${r.maker} ${r.model}`,
      stateLabel: STATE_LABEL[r.state as JobState].owner,
    }));
}

async function openClaims(tx: TxContext["tx"] | typeof db, ownerId: string) {
  return tx
    .select({ id: claims.id })
    .from(claims)
    .innerJoin(certificates, eq(certificates.id, claims.certificateId))
    .where(and(eq(certificates.customerId, ownerId), inArray(claims.status, ["open", "inspecting"])));
}

export async function getOwnerAccount({ ownerId }: { ownerId: string }) {
  const [u] = await db
    .select({ name: user.name, email: user.email, phone: user.phone, contactPreference: user.contactPreference })
    .from(user)
    .where(eq(user.id, ownerId));
  if (!u) throw new AppError("not_found", "That account was not found.");
  const [addresses, open, claimsOpen] = await Promise.all([listAddresses({ ownerId }), openJobs(db, ownerId), openClaims(db, ownerId)]);
  return {
    profile: {
      name: u.name,
      email: u.email,
      phone: u.phone ?? "",
      contactPreference: u.contactPreference === "phone" ? "phone" : "email",
    } as const,
    addresses,
    openJobs: open,
    openClaims: claimsOpen.length,
  };
}
export type OwnerAccountView = Awaited<ReturnType<typeof getOwnerAccount>>;

export async function updateProfile(ctx: TxContext, { ownerId, input }: { ownerId: string; input: ProfileValues }) {
  const [before] = await ctx.tx
    .select({ name: user.name, phone: user.phone, contactPreference: user.contactPreference })
    .from(user)
    .where(eq(user.id, ownerId));
  await ctx.tx
    .update(user)
    .set({ name: input.name, phone: input.phone || null, contactPreference: input.contactPreference, updatedAt: new Date() })
    .where(eq(user.id, ownerId));
  await audit(ctx, {
    actorId: ownerId,
    action: "account.profile_update",
    entity: "user",
    entityId: ownerId,
    before: before ?? null,
    after: { name: input.name, phone: input.phone || null, contactPreference: input.contactPreference },
  });
}

async function ownAddress(ctx: TxContext, ownerId: string, addressId: string) {
  const [row] = await ctx.tx
    .select()
    .from(ownerAddresses)
    .where(and(eq(ownerAddresses.id, addressId), eq(ownerAddresses.ownerId, ownerId)))
    .for("update");
  // Someone else's address is not found, as if it did not exist.
  if (!row) throw new AppError("not_found", "That address was not found.");
  return row;
}

function columns(v: AddressValues) {
  return {
    recipient: v.recipient,
    line1: v.line1,
    line2: v.line2 ?? null,
    city: v.city,
    region: v.region ?? null,
    postalCode: v.postalCode ?? null,
    country: v.country,
  };
}

async function clearDefault(ctx: TxContext, ownerId: string) {
  await ctx.tx
    .update(ownerAddresses)
    .set({ isDefault: false })
    .where(and(eq(ownerAddresses.ownerId, ownerId), eq(ownerAddresses.isDefault, true)));
}

export async function addAddress(ctx: TxContext, { ownerId, input }: { ownerId: string; input: AddressValues }) {
  // Serialise an owner's address-book changes so two at once cannot leave two defaults.
  await ctx.tx.select({ id: user.id }).from(user).where(eq(user.id, ownerId)).for("update");
  const [{ count }] = (await ctx.tx
    .select({ count: sql<number>`count(*)::int` })
    .from(ownerAddresses)
    .where(eq(ownerAddresses.ownerId, ownerId))) as [{ count: number }];
  if (count >= 20) throw new AppError("conflict", "Addresses: twenty at most; remove one you no longer use first.");
  // The first address is the default, whatever the form said.
  const isDefault = input.isDefault || count === 0;
  if (isDefault) await clearDefault(ctx, ownerId);
  const [row] = await ctx.tx
    .insert(ownerAddresses)
    .values({ ownerId, ...columns(input), isDefault })
    .returning();
  await audit(ctx, {
    actorId: ownerId,
    action: "account.address_add",
    entity: "owner_address",
    entityId: row!.id,
    after: { country: input.country, isDefault },
  });
  return toAddress(row!);
}

export async function updateAddress(
  ctx: TxContext,
  { ownerId, addressId, input }: { ownerId: string; addressId: string; input: AddressValues },
) {
  await ctx.tx.select({ id: user.id }).from(user).where(eq(user.id, ownerId)).for("update");
  const before = await ownAddress(ctx, ownerId, addressId);
  // Unticking the default is not a way to have none: another address must be made the default instead.
  const isDefault = input.isDefault || before.isDefault;
  if (isDefault && !before.isDefault) await clearDefault(ctx, ownerId);
  const [row] = await ctx.tx
    .update(ownerAddresses)
    .set({ ...columns(input), isDefault, updatedAt: new Date() })
    .where(eq(ownerAddresses.id, addressId))
    .returning();
  await audit(ctx, {
    actorId: ownerId,
    action: "account.address_update",
    entity: "owner_address",
    entityId: addressId,
    after: { country: input.country, isDefault },
  });
  return toAddress(row!);
}

export async function removeAddress(ctx: TxContext, { ownerId, addressId }: { ownerId: string; addressId: string }) {
  await ctx.tx.select({ id: user.id }).from(user).where(eq(user.id, ownerId)).for("update");
  const before = await ownAddress(ctx, ownerId, addressId);
  await ctx.tx.delete(ownerAddresses).where(eq(ownerAddresses.id, addressId));
  // The default moves to the oldest address left, so an owner with addresses always has one.
  if (before.isDefault) {
    const [next] = await ctx.tx
      .select({ id: ownerAddresses.id })
      .from(ownerAddresses)
      .where(eq(ownerAddresses.ownerId, ownerId))
      .orderBy(asc(ownerAddresses.createdAt))
      .limit(1);
    if (next) await ctx.tx.update(ownerAddresses).set({ isDefault: true }).where(eq(ownerAddresses.id, next.id));
  }
  await audit(ctx, { actorId: ownerId, action: "account.address_remove", entity: "owner_address", entityId: addressId });
}

/** States in which the owner may still say where the set goes back: until it has left the shop. */
export function canChooseReturnAddress(state: JobState): boolean {
  return !isTerminal(state);
}

/**
 * The owner chooses where the set is shipped back. The job keeps a copy of the address as it is now, so later
 * edits to the address book do not move it.
 */
export async function chooseReturnAddress(
  ctx: TxContext,
  { ownerId, jobId, addressId }: { ownerId: string; jobId: string; addressId: string },
) {
  const [job] = await ctx.tx
    .select({ id: jobs.id, state: jobs.state, returnAddress: jobs.returnAddress })
    .from(jobs)
    .where(and(eq(jobs.id, jobId), eq(jobs.customerId, ownerId)))
    .for("update");
  if (!job) throw new AppError("not_found", "That job was not found.");
  if (!canChooseReturnAddress(job.state)) {
    throw new AppError("conflict", "Return address: this job is closed; the set has already gone back or will not be returned by post.");
  }
  const row = await ownAddress(ctx, ownerId, addressId);
  const { id: _id, isDefault: _d, lines, ...snapshot } = toAddress(row);
  const now = new Date();
  await ctx.tx.update(jobs).set({ returnAddress: snapshot, returnAddressChosenAt: now, updatedAt: now }).where(eq(jobs.id, jobId));
  await audit(ctx, {
    actorId: ownerId,
    action: "job.return_address",
    entity: "job",
    entityId: jobId,
    before: job.returnAddress ? { lines: formatPostalAddress(job.returnAddress) } : null,
    after: { lines },
  });
  return { lines };
}

/**
 * Where a job's set is shipped back, as label lines: the address the owner chose for it, else (not yet chosen)
 * the owner's default address, marked as such. Null when there is neither. For receipts, labels and the bench.
 */
export async function jobShipToLines({ jobId }: { jobId: string }): Promise<{ lines: string[]; chosen: boolean } | null> {
  const [job] = await db.select({ customerId: jobs.customerId, returnAddress: jobs.returnAddress }).from(jobs).where(eq(jobs.id, jobId));
  if (!job) return null;
  if (job.returnAddress) return { lines: formatPostalAddress(job.returnAddress), chosen: true };
  const [fallback] = await db
    .select()
    .from(ownerAddresses)
    .where(and(eq(ownerAddresses.ownerId, job.customerId), eq(ownerAddresses.isDefault, true)));
  return fallback ? { lines: toAddress(fallback).lines, chosen: false } : null;
}

/** Copies the owner's default address onto a job that is shipped back without a chosen one. */
export async function snapshotDefaultReturnAddress(ctx: TxContext, { jobId }: { jobId: string }): Promise<void> {
  const [job] = await ctx.tx
    .select({ customerId: jobs.customerId, returnAddress: jobs.returnAddress })
    .from(jobs)
    .where(eq(jobs.id, jobId));
  if (!job || job.returnAddress) return;
  const [row] = await ctx.tx
    .select()
    .from(ownerAddresses)
    .where(and(eq(ownerAddresses.ownerId, job.customerId), eq(ownerAddresses.isDefault, true)));
  if (!row) return;
  const { id: _id, isDefault: _d, lines: _l, ...snapshot } = toAddress(row);
  await ctx.tx.update(jobs).set({ returnAddress: snapshot, returnAddressChosenAt: new Date() }).where(eq(jobs.id, jobId));
}

/**
 * Closes the owner's account. Refused while a job is not at an end state or a warranty claim is open. The
 * records the shop must keep (jobs, estimates, payments and refunds, certificates, claims, the messages and
 * photos of each job, the address a finished job was shipped to) stay, tied to the anonymised account; the
 * address book, phone, name, e-mail, password and sessions go.
 */
export async function closeAccount(ctx: TxContext, { ownerId, password }: { ownerId: string; password: string }) {
  const [u] = await ctx.tx.select().from(user).where(eq(user.id, ownerId)).for("update");
  if (!u || u.closedAt) throw new AppError("not_found", "That account was not found.");
  const [credential] = await ctx.tx
    .select({ password: account.password })
    .from(account)
    .where(and(eq(account.userId, ownerId), eq(account.providerId, "credential")));
  if (!credential?.password || !(await verifyPassword({ hash: credential.password, password }))) {
    throw new AppError("invalid_input", "Password: that is not your current password.", {
      password: "Password: that is not your current password.",
    });
  }
  const open = await openJobs(ctx.tx, ownerId);
  if (open.length > 0) {
    const named = open.map((j) => `${j.number} (${j.setName}, ${j.stateLabel.toLowerCase()})`).join("; ");
    throw new AppError("conflict", `Your account cannot be closed while a job is still open: ${named}. Close or finish these first.`);
  }
  if ((await openClaims(ctx.tx, ownerId)).length > 0) {
    throw new AppError("conflict", "Your account cannot be closed while a warranty claim is open. The shop will answer it first.");
  }
  const removed = await ctx.tx.delete(ownerAddresses).where(eq(ownerAddresses.ownerId, ownerId)).returning({ id: ownerAddresses.id });
  await ctx.tx.delete(session).where(eq(session.userId, ownerId));
  await ctx.tx.delete(account).where(eq(account.userId, ownerId));
  await ctx.tx.delete(verification).where(eq(verification.identifier, u.email));
  const now = new Date();
  await ctx.tx
    .update(user)
    .set({
      name: CLOSED_ACCOUNT_NAME,
      // Unique, never deliverable (.invalid is reserved, RFC 2606), and never an address anyone can sign up with.
      email: `closed-${ownerId}@closed.invalid`,
      emailVerified: false,
      phone: null,
      image: null,
      contactPreference: "email",
      banned: true,
      banReason: "Account closed by its owner",
      closedAt: now,
      updatedAt: now,
    })
    .where(eq(user.id, ownerId));
  await audit(ctx, {
    actorId: ownerId,
    action: "account.close",
    entity: "user",
    entityId: ownerId,
    after: { addressesRemoved: removed.length, closedAt: now.toISOString() },
  });
}
