import { betterAuth } from "better-auth";
import { APIError, createAuthMiddleware } from "better-auth/api";
import { AccountUpdateSchema } from "@shared/schemas/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import type { Database } from "./db/client";
import { accounts, sessions, users, verifications } from "./db/schema";

export const CLIENT_IP_HEADER = "x-orthostack-client-ip";

export type AuthOptions = {
  db: Database;
  baseURL: string;
  secret: string;
  trustedOrigins?: string[];
  /** Sign-in attempts per client address per minute. */
  signInPerMinute?: number;
};

/**
 * better-auth with e-mail and password. Accounts are created only by accepting an invitation
 * (or by the seed): sign-up is disabled in better-auth, the server creates accounts directly.
 */
export function createAuth({ db, baseURL, secret, trustedOrigins = [], signInPerMinute = 10 }: AuthOptions) {
  return betterAuth({
    baseURL,
    basePath: "/api/auth",
    secret,
    // The app's own address, the configured ones, and the address this request was sent to:
    // Express's sameOrigin guard has already checked Origin against exactly these, so a person
    // who opens the app as 127.0.0.1 or by its host name signs in alike.
    trustedOrigins: (request?: Request) => [baseURL, ...trustedOrigins, ...(request ? [new URL(request.url).origin] : [])],
    database: drizzleAdapter(db, {
      provider: "pg",
      schema: { user: users, session: sessions, account: accounts, verification: verifications },
    }),
    // Sign-up is off in better-auth itself, whatever spelling of the path a request uses; accounts
    // are made on the server by createAccount (backend/lib/accounts.ts) when an invitation is accepted.
    // A reset link (sent by an admin, backend/services/password-reset.ts) ends every session.
    emailAndPassword: {
      enabled: true,
      disableSignUp: true,
      minPasswordLength: 10,
      maxPasswordLength: 128,
      revokeSessionsOnPasswordReset: true,
    },
    hooks: { before: accountRules },
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24 },
    rateLimit: {
      enabled: true,
      storage: "memory",
      window: 60,
      max: 300,
      customRules: { "/sign-in/email": { window: 60, max: signInPerMinute } },
    },
    // The Express app writes the socket's address into this header (and drops any sent by the
    // client), so the rate limit keys on the real peer and cannot be dodged by a forged header.
    advanced: { ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] } },
    telemetry: { enabled: false },
  });
}

export type Auth = ReturnType<typeof createAuth>;

/**
 * Rules better-auth's own routes keep, whatever the client sends: a password change always ends
 * the person's other sessions, and a name set through update-user is limited like every name.
 */
const accountRules = createAuthMiddleware(async (ctx) => {
  if (ctx.path === "/change-password") {
    return { context: { ...ctx, body: { ...ctx.body, revokeOtherSessions: true } } };
  }
  if (ctx.path === "/update-user") {
    const parsed = AccountUpdateSchema.safeParse(ctx.body ?? {});
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const field = issue?.path.join(".") || "body";
      throw new APIError("BAD_REQUEST", { code: "invalid_input", message: `${field}: ${issue?.message ?? "not accepted"}` });
    }
    return { context: { ...ctx, body: parsed.data } };
  }
});
