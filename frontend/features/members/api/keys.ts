export const memberKeys = {
  all: ["members"] as const,
  list: () => [...memberKeys.all, "list"] as const,
  invitations: () => [...memberKeys.all, "invitations"] as const,
};
