import "server-only";
import { betterAuth } from "better-auth";
import { APIError, createAuthMiddleware, getSessionFromCtx } from "better-auth/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { nextCookies } from "better-auth/next-js";
import { admin } from "better-auth/plugins";
import { createAccessControl } from "better-auth/plugins/access";
import { defaultStatements } from "better-auth/plugins/admin/access";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import * as schema from "@/db/schema";
import { env } from "./env";
import { queueEmailNow } from "./mail";
import { isCommonPassword } from "./common-passwords";
import { NUL_MESSAGE, nulCharacterPath } from "./errors";
import { hashPassword, verifyPassword } from "./password";
import { auditNow } from "./audit";
import { ACCOUNT_FAILURE_LIMIT, emailKey, oversizedField, recentFailures, recordFailedSignIn, withoutSecrets } from "./auth-guards";
import { CLIENT_ADDRESS_HEADER } from "./client-address";

// The sign-in service's own account-administration endpoints that change something: each leaves an audit row.
const ADMIN_CHANGES = new Set([
  "/admin/create-user",
  "/admin/update-user",
  "/admin/set-role",
  "/admin/ban-user",
  "/admin/unban-user",
  "/admin/remove-user",
  "/admin/set-user-password",
  "/admin/revoke-user-session",
  "/admin/revoke-user-sessions",
  "/admin/impersonate-user",
  "/admin/stop-impersonating",
]);

// The same answer as the per-address limiter gives, for a known or an unknown e-mail alike.
const TOO_MANY = "Too many requests. Please try again later.";

// better-auth's own admin endpoints: only the shop owner may use them.
const ac = createAccessControl(defaultStatements);
const ownerRole = ac.newRole({
  user: ["create", "list", "set-role", "ban", "get", "update"],
  session: ["list", "revoke"],
});
const staffRole = ac.newRole({ user: [], session: [] });

export const SESSION_SLIDING_SECONDS = 60 * 60 * 24 * 7;
export const SESSION_ABSOLUTE_SECONDS = 60 * 60 * 24 * 30;

function createAuth() {
  const e = env();
  const appUrl = new URL(e.APP_URL);
  const alternate = new URL(e.APP_URL);
  alternate.hostname = appUrl.hostname === "127.0.0.1" ? "localhost" : appUrl.hostname === "localhost" ? "127.0.0.1" : appUrl.hostname;
  return betterAuth({
    appName: "Bandedge",
    baseURL: e.APP_URL,
    secret: e.BETTER_AUTH_SECRET,
    trustedOrigins: [appUrl.origin, alternate.origin],
    database: drizzleAdapter(getDb(), { provider: "pg", schema }),
    telemetry: { enabled: false },
    emailAndPassword: {
      enabled: true,
      requireEmailVerification: true,
      minPasswordLength: 8,
      maxPasswordLength: 128,
      revokeSessionsOnPasswordReset: true,
      onPasswordReset: async ({ user }) => {
        await auditNow({ actorId: user.id, action: "auth.password_reset", entity: "user", entityId: user.id });
      },
      resetPasswordTokenExpiresIn: 60 * 60,
      password: { hash: hashPassword, verify: verifyPassword },
      // Always the password-reset message: staff invitations are their own tokens (services/staff-invitations.ts).
      sendResetPassword: async ({ user: who, url }) => {
        // A contact the shop keeps without sign-in gets no password by the back door; the shop invites them.
        const [row] = await getDb()
          .select({ contactOnly: schema.user.contactOnly })
          .from(schema.user)
          .where(eq(schema.user.id, who.id))
          .limit(1);
        if (row?.contactOnly) return;
        const user = who;
        await queueEmailNow({
          to: user.email,
          template: "reset-password",
          props: { name: user.name, url },
          dedupeKey: `reset:${user.id}:${url}`,
        });
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60,
      sendVerificationEmail: async ({ user, url }) => {
        await queueEmailNow({
          to: user.email,
          template: "verify-email",
          props: { name: user.name, url },
          dedupeKey: `verify:${user.id}:${url}`,
        });
      },
    },
    // A new e-mail address takes effect only once a link sent to it is opened (the verification message through
    // the outbox); until then the old address stays the account's.
    user: { changeEmail: { enabled: true } },
    session: {
      expiresIn: SESSION_SLIDING_SECONDS,
      updateAge: 60 * 60 * 24,
      cookieCache: { enabled: false },
    },
    rateLimit: {
      enabled: e.NODE_ENV === "production",
      storage: "database",
      modelName: "rateLimit",
      window: 60,
      max: 200,
      customRules: {
        "/sign-in/email": { window: e.AUTH_RATE_LIMIT_WINDOW_SECONDS, max: e.AUTH_RATE_LIMIT_MAX },
        "/sign-up/email": { window: e.AUTH_RATE_LIMIT_WINDOW_SECONDS, max: e.AUTH_RATE_LIMIT_MAX },
        "/request-password-reset": { window: e.AUTH_RATE_LIMIT_WINDOW_SECONDS, max: e.AUTH_RATE_LIMIT_MAX },
        "/reset-password": { window: e.AUTH_RATE_LIMIT_WINDOW_SECONDS, max: e.AUTH_RATE_LIMIT_MAX },
      },
    },
    advanced: {
      // Set by app/api/auth/[...all]/route.ts from the trusted proxies only (lib/server/client-address.ts).
      ipAddress: { ipAddressHeaders: [CLIENT_ADDRESS_HEADER] },
      useSecureCookies: appUrl.protocol === "https:",
    },
    databaseHooks: {
      user: {
        create: {
          before: async (user) => {
            // Sign-up never chooses its own role; staff are created by the owner.
            return { data: { ...user, role: user.role === "technician" || user.role === "owner" ? user.role : "customer" } };
          },
        },
      },
    },
    hooks: {
      before: createAuthMiddleware(async (ctx) => {
        // Text the database cannot store (a NUL character) is refused as bad input, not left to fail there.
        if (nulCharacterPath(ctx.body ?? null) || nulCharacterPath(ctx.query ?? null)) {
          throw new APIError("BAD_REQUEST", { code: "INVALID_CHARACTER", message: NUL_MESSAGE });
        }
        // Every field has a server-side limit, whatever the browser forms check.
        const oversized = oversizedField(ctx.body ?? null) ?? oversizedField(ctx.query ?? null);
        if (oversized) throw new APIError("BAD_REQUEST", { code: "FIELD_TOO_LONG", message: oversized.message });
        if (ctx.path === "/sign-in/email") {
          const email = (ctx.body as { email?: unknown } | undefined)?.email;
          if (typeof email === "string" && (await recentFailures(email)) >= ACCOUNT_FAILURE_LIMIT) {
            throw new APIError("TOO_MANY_REQUESTS", { message: TOO_MANY });
          }
          return;
        }
        if (ctx.path === "/sign-out") {
          const current = await getSessionFromCtx(ctx).catch(() => null);
          if (current) {
            await auditNow({ actorId: current.user.id, action: "auth.sign_out", entity: "user", entityId: current.user.id });
          }
          return;
        }
        if (ctx.path === "/change-password" && ctx.body && typeof ctx.body === "object") {
          // A changed password ends every other session, whatever the caller asked.
          (ctx.body as { revokeOtherSessions?: boolean }).revokeOtherSessions = true;
        }
        if (ctx.path !== "/sign-up/email" && ctx.path !== "/reset-password" && ctx.path !== "/change-password") return;
        const body = (ctx.body ?? {}) as { password?: unknown; newPassword?: unknown };
        const candidate = typeof body.newPassword === "string" ? body.newPassword : body.password;
        if (typeof candidate === "string" && isCommonPassword(candidate)) {
          throw new APIError("BAD_REQUEST", {
            code: "PASSWORD_TOO_COMMON",
            message: "That password is on the list of the most commonly used passwords. Please choose another.",
          });
        }
      }),
      after: createAuthMiddleware(async (ctx) => {
        const address = ctx.headers?.get(CLIENT_ADDRESS_HEADER) ?? null;
        const returned = ctx.context.returned;
        const failed = returned instanceof APIError;
        if (ctx.path === "/sign-in/email") {
          const email = (ctx.body as { email?: unknown } | undefined)?.email;
          if (typeof email !== "string") return;
          if (failed) {
            await recordFailedSignIn(email, address, returned.body?.code ?? returned.status.toString());
          } else if (ctx.context.newSession) {
            const id = ctx.context.newSession.user.id;
            await auditNow({ actorId: id, action: "auth.sign_in", entity: "user", entityId: id, after: { address } });
          }
          return;
        }
        if (ctx.path === "/request-password-reset" && !failed) {
          const email = (ctx.body as { email?: unknown } | undefined)?.email;
          if (typeof email === "string") {
            await auditNow({
              actorId: null,
              action: "auth.password_reset_requested",
              entity: "sign_in",
              entityId: emailKey(email),
              after: { address },
            });
          }
          return;
        }
        if ((ctx.path === "/change-password" || ctx.path === "/change-email") && !failed) {
          const current = await getSessionFromCtx(ctx).catch(() => null);
          const id = current?.user.id ?? (returned as { user?: { id?: string } } | undefined)?.user?.id;
          if (id) {
            await auditNow({
              actorId: id,
              action: ctx.path === "/change-password" ? "auth.password_change" : "auth.email_change_requested",
              entity: "user",
              entityId: id,
              after: ctx.path === "/change-email" ? { address } : { address, otherSessionsEnded: true },
            });
          }
          return;
        }
        if (ADMIN_CHANGES.has(ctx.path)) {
          const actor = await getSessionFromCtx(ctx).catch(() => null);
          const body = withoutSecrets(ctx.body);
          const created = (returned as { user?: { id?: string } } | undefined)?.user?.id;
          const target = typeof body.userId === "string" ? body.userId : (created ?? "unknown");
          await auditNow({
            actorId: actor?.user.id ?? null,
            action: `auth.admin.${ctx.path.slice("/admin/".length)}`,
            entity: "user",
            entityId: target,
            after: { ...body, outcome: failed ? `refused (${returned.status})` : "done" },
          });
        }
      }),
    },
    plugins: [
      admin({
        ac,
        roles: { owner: ownerRole, technician: staffRole, customer: staffRole },
        defaultRole: "customer",
        adminRoles: ["owner"],
      }),
      nextCookies(),
    ],
  });
}

type Auth = ReturnType<typeof createAuth>;
const g = globalThis as unknown as { bandedgeAuth?: Auth };

export function auth(): Auth {
  g.bandedgeAuth ??= createAuth();
  return g.bandedgeAuth;
}

export { isCommonPassword };
