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
 * (or by the seed): the app blocks the public sign-up route, the server calls the API directly.
 */
export function createAuth({ db, baseURL, secret, trustedOrigins = [], signInPerMinute = 10 }: AuthOptions) {
  return betterAuth({
    baseURL,
    basePath: "/api/auth",
    secret,
    trustedOrigins: [baseURL, ...trustedOrigins],
    database: drizzleAdapter(db, {
      provider: "pg",
      schema: { user: users, session: sessions, account: accounts, verification: verifications },
    }),
    emailAndPassword: { enabled: true, minPasswordLength: 10, maxPasswordLength: 128, autoSignIn: true },
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
