import { randomBytes } from "node:crypto";
import type { Auth } from "../auth";

export type NewAccount = { email: string; name: string; password: string };

/**
 * Creates a user with an e-mail/password credential directly through better-auth's internal
 * adapter. Public sign-up is switched off in better-auth itself (`disableSignUp`), so this is
 * the only way an account comes to exist: the invitation accept route and the seed call it.
 */
export async function createAccount(auth: Auth, input: NewAccount): Promise<{ id: string; email: string; name: string }> {
  const ctx = await auth.$context;
  const hash = await ctx.password.hash(input.password);
  const user = await ctx.internalAdapter.createUser(
    { email: input.email.toLowerCase(), name: input.name, emailVerified: false },
    { method: "email-password" },
  );
  await ctx.internalAdapter.linkAccount({ userId: user.id, providerId: "credential", accountId: user.id, password: hash });
  return { id: user.id, email: user.email, name: user.name };
}

/** Ends every session of the user at once (removed member, password reset by an admin). */
export async function endSessions(auth: Auth, userId: string): Promise<void> {
  const ctx = await auth.$context;
  await ctx.internalAdapter.deleteUserSessions(userId);
}

/**
 * Gives an account that lost its membership a new name and password when its owner accepts a
 * new invitation: the invitation link proves they hold the address, as it does for a new account.
 */
export async function renewAccount(auth: Auth, userId: string, input: { name: string; password: string }): Promise<void> {
  const ctx = await auth.$context;
  await ctx.internalAdapter.updateUser(userId, { name: input.name });
  await ctx.internalAdapter.updatePassword(userId, await ctx.password.hash(input.password));
  await ctx.internalAdapter.deleteUserSessions(userId);
}

/** How long a reset link sent by an admin works. */
export const RESET_LINK_HOURS = 24;

/**
 * A password-reset token in better-auth's own store, exactly as its request-password-reset
 * endpoint makes one, so its reset-password endpoint consumes it (single use, expiring). Public
 * reset requests stay off (no sendResetPassword is configured): only an admin sends a link.
 */
export async function issueResetToken(auth: Auth, userId: string, now: Date): Promise<string> {
  const ctx = await auth.$context;
  const token = randomBytes(24).toString("base64url");
  await ctx.internalAdapter.createVerificationValue({
    identifier: `reset-password:${token}`,
    value: userId,
    expiresAt: new Date(now.getTime() + RESET_LINK_HOURS * 3_600_000),
  });
  return token;
}
