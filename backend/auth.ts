import { betterAuth, type BetterAuthRateLimitOptions } from "better-auth";
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
      customStorage: rateLimitCounters(),
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

type RateLimitStorage = NonNullable<BetterAuthRateLimitOptions["customStorage"]>;

/**
 * The rate limiter's counters, one set per auth instance. better-auth's own "memory" storage is
 * a map in its module, shared by every app in the process: tests that start several apps in one
 * process would count one another's sign-ins. A fixed window per key (client address and path),
 * pruned of ended windows when it grows.
 */
function rateLimitCounters(maxKeys = 100_000): RateLimitStorage {
  const windows = new Map<string, { count: number; endsAt: number }>();
  return {
    async consume(key, { window, max }) {
      const now = Date.now();
      if (windows.size >= maxKeys) {
        for (const [k, w] of windows) if (now >= w.endsAt) windows.delete(k);
        // still full of live windows: drop the oldest, as better-auth's own store does
        for (const k of windows.keys()) {
          if (windows.size < maxKeys) break;
          windows.delete(k);
        }
      }
      const current = windows.get(key);
      if (!current || now >= current.endsAt) {
        windows.set(key, { count: 1, endsAt: now + window * 1000 });
        return { allowed: true, retryAfter: null };
      }
      if (current.count >= max) return { allowed: false, retryAfter: Math.ceil((current.endsAt - now) / 1000) };
      current.count += 1;
      return { allowed: true, retryAfter: null };
    },
  };
}

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
