/**
 * Organisation API tokens as credentials: the token a bearer secret belongs
 * to, and why it is refused when it is. Created and revoked on the API
 * tokens page (app/organizations/api-tokens.server.ts).
 */
import { and, eq, isNull, lt, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { apiTokens } from "~/db/schema";
import { dateTimeUtc } from "~/lib/format";
import type { TokenRole } from "./permissions";
import { hashToken } from "./tokens.server";

export interface ApiTokenPrincipal {
  organizationId: string;
  tokenId: string;
  role: TokenRole;
}

export type ApiTokenCheck =
  { ok: true; token: ApiTokenPrincipal } | { ok: false; message: string };

// last_used_at is written at most once a minute per token: a reporting tool
// that reads every second must not turn each read into a row update (and a
// dead tuple), and a minute is all the page's "last used" needs.
const LAST_USED_RESOLUTION_MS = 60_000;

/**
 * The token a secret belongs to, if it is usable now. The secret carries 256
 * random bits, so the lookup is by its SHA-256 hash alone (no salt or slow
 * hash needed: nothing to guess from a hash of a random value).
 */
export async function authenticateApiToken(
  secret: string,
  now = new Date(),
): Promise<ApiTokenCheck> {
  const [row] = await db
    .select({
      organizationId: apiTokens.organizationId,
      tokenId: apiTokens.id,
      role: apiTokens.role,
      expiresAt: apiTokens.expiresAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(eq(apiTokens.tokenHash, hashToken(secret)));
  if (!row) return { ok: false, message: "The API token is unknown." };
  if (row.revokedAt)
    return {
      ok: false,
      message: `The API token was revoked on ${dateTimeUtc(row.revokedAt)}.`,
    };
  if (row.expiresAt && row.expiresAt <= now)
    return {
      ok: false,
      message: `The API token expired on ${dateTimeUtc(row.expiresAt)}; ask an owner for a new one.`,
    };
  await markUsed(row.organizationId, row.tokenId, now);
  return {
    ok: true,
    token: {
      organizationId: row.organizationId,
      tokenId: row.tokenId,
      // The table's check constraint holds tokens to these two roles.
      role: row.role as TokenRole,
    },
  };
}

async function markUsed(organizationId: string, tokenId: string, now: Date) {
  await db
    .update(apiTokens)
    .set({ lastUsedAt: now })
    .where(
      and(
        eq(apiTokens.organizationId, organizationId),
        eq(apiTokens.id, tokenId),
        or(
          isNull(apiTokens.lastUsedAt),
          lt(
            apiTokens.lastUsedAt,
            new Date(now.getTime() - LAST_USED_RESOLUTION_MS),
          ),
        ),
      ),
    );
}
