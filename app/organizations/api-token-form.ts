/**
 * The API tokens page's form: what a new token is called, the role it acts
 * with and how long it lives. A plain module: the page shows the choices and
 * the server parses with the same schema.
 */
import { z } from "zod";
import { tokenRoles } from "~/auth/permissions";
import { idField } from "~/lib/ids";

/** Lifetimes offered, in days; "never" must be chosen on purpose. */
export const tokenLifetimes = ["30", "90", "365", "never"] as const;
export type TokenLifetime = (typeof tokenLifetimes)[number];
export const DEFAULT_TOKEN_LIFETIME: TokenLifetime = "90";

export const tokenLifetimeLabels: Record<TokenLifetime, string> = {
  "30": "30 days",
  "90": "90 days",
  "365": "1 year",
  never: "Never expires",
};

export const createTokenSchema = z.strictObject({
  intent: z.literal("create"),
  name: z
    .string()
    .trim()
    .min(1, "Name the token after what uses it, e.g. “Monthly report script”.")
    .max(80, "Use at most 80 characters."),
  role: z.enum(tokenRoles, {
    error: "Choose read-only (auditor) or energy manager.",
  }),
  lifetime: z.enum(tokenLifetimes, {
    error: "Choose how long the token lives.",
  }),
});

// Revoking cuts a tool off at once, so it takes two steps, as for gateways:
// only the confirmation form sends `confirm`.
export const revokeTokenSchema = z.strictObject({
  intent: z.literal("revoke"),
  tokenId: idField("Unknown token."),
  confirm: z.literal("yes", {
    error: "Confirm the revocation first: choose Revoke… beside the token.",
  }),
});

const DAY_MS = 86_400_000;

/** When a token made at `now` with this lifetime stops working. */
export function expiryFor(lifetime: TokenLifetime, now: Date): Date | null {
  return lifetime === "never"
    ? null
    : new Date(now.getTime() + Number(lifetime) * DAY_MS);
}
