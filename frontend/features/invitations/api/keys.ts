export const invitationKeys = {
  all: ["invitation"] as const,
  byToken: (token: string) => [...invitationKeys.all, token] as const,
};
