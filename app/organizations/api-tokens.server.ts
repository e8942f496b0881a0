/**
 * Organisation API tokens: created and revoked by an owner, as gateway keys
 * are (app/gateways/manage-gateways.server.ts). The secret is returned once
 * and stored only as its SHA-256 hash; authentication is in
 * app/auth/api-token.server.ts.
 */
import { and, desc, eq, isNull } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import {
  apiTokenPrefix,
  newApiTokenSecret,
} from "~/auth/api-token-keys.server";
import type { TokenRole } from "~/auth/permissions";
import { hashToken } from "~/auth/tokens.server";
import { db } from "~/db/client.server";
import { apiTokens, users } from "~/db/schema";

export async function listApiTokens({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      role: apiTokens.role,
      tokenPrefix: apiTokens.tokenPrefix,
      createdByName: users.name,
      createdAt: apiTokens.createdAt,
      expiresAt: apiTokens.expiresAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .leftJoin(users, eq(users.id, apiTokens.createdByUserId))
    .where(eq(apiTokens.organizationId, organizationId))
    .orderBy(desc(apiTokens.createdAt));
}

/** Creates a token; the secret is returned this once and never stored. */
export async function createApiToken(args: {
  organizationId: string;
  actorUserId: string;
  name: string;
  role: TokenRole;
  expiresAt: Date | null;
}) {
  const secret = newApiTokenSecret();
  const tokenPrefix = apiTokenPrefix(secret);
  const id = await db.transaction(async (tx) => {
    const [token] = await tx
      .insert(apiTokens)
      .values({
        organizationId: args.organizationId,
        name: args.name,
        role: args.role,
        // SHA-256 of a 256-bit random secret: the usual practice for API
        // tokens; a slow password hash adds nothing against a random value.
        tokenHash: hashToken(secret),
        tokenPrefix,
        createdByUserId: args.actorUserId,
        expiresAt: args.expiresAt,
      })
      .returning({ id: apiTokens.id });
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "api_token.created",
      subject: token.id,
      after: {
        name: args.name,
        role: args.role,
        keyPrefix: tokenPrefix,
        expiresAt: args.expiresAt?.toISOString() ?? null,
        state: "active",
      },
    });
    return token.id;
  });
  return { id, secret };
}

/** Revokes an active token; false when the organisation has none such. */
export async function revokeApiToken(args: {
  organizationId: string;
  actorUserId: string;
  tokenId: string;
}) {
  return db.transaction(async (tx) => {
    const revoked = await tx
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(
        and(
          eq(apiTokens.organizationId, args.organizationId),
          eq(apiTokens.id, args.tokenId),
          isNull(apiTokens.revokedAt),
        ),
      )
      .returning({ name: apiTokens.name, keyPrefix: apiTokens.tokenPrefix });
    if (revoked.length === 0) return false;
    const [{ name, keyPrefix }] = revoked;
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "api_token.revoked",
      subject: args.tokenId,
      before: { name, keyPrefix, state: "active" },
      after: { name, keyPrefix, state: "revoked" },
    });
    return true;
  });
}
