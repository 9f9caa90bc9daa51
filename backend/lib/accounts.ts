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
