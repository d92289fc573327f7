import "server-only";
import { betterAuth } from "better-auth";
import { APIError, createAuthMiddleware } from "better-auth/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { nextCookies } from "better-auth/next-js";
import { admin } from "better-auth/plugins";
import { createAccessControl } from "better-auth/plugins/access";
import { defaultStatements } from "better-auth/plugins/admin/access";
import { getDb } from "@/db";
import * as schema from "@/db/schema";
import { env } from "./env";
import { queueEmailNow } from "./mail";
import { isCommonPassword } from "./common-passwords";
import { NUL_MESSAGE, nulCharacterPath } from "./errors";
import { hashPassword, verifyPassword } from "./password";

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
      resetPasswordTokenExpiresIn: 60 * 60,
      password: { hash: hashPassword, verify: verifyPassword },
      sendResetPassword: async ({ user, url }) => {
        const callback = new URL(url).searchParams.get("callbackURL") ?? "";
        const welcome = callback.includes("welcome=");
        if (welcome) {
          const roleLabel = (user as { role?: string }).role === "owner" ? "Shop owner" : "Technician";
          await queueEmailNow({
            to: user.email,
            template: "staff-invite",
            props: { name: user.name, url, roleLabel, invitedBy: "the shop owner" },
            dedupeKey: `invite:${user.id}:${url}`,
          });
          return;
        }
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
      ipAddress: { ipAddressHeaders: [e.TRUSTED_IP_HEADER] },
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
