import { betterAuth } from "better-auth";
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
    emailAndPassword: { enabled: true, disableSignUp: true, minPasswordLength: 10, maxPasswordLength: 128 },
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
