// The client reads the one rights table of shared/permissions.ts. The server checks every
// route on its own; hiding a button here is a courtesy, not a check.
export { can, homePath, ROLE_DESCRIPTIONS, ROLE_LABELS, type Right } from "@shared/permissions";
