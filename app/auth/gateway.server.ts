import { and, eq, isNull, lt, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { gateways } from "~/db/schema";
import { hashToken } from "./tokens.server";

export interface GatewayPrincipal {
  kind: "gateway";
  organizationId: string;
  gatewayId: string;
  name: string;
}

// last_seen_at is written at most once a minute per gateway, not per request.
const LAST_SEEN_RESOLUTION_MS = 60_000;

/**
 * The gateway a bearer key belongs to, or null for an unknown or revoked key.
 */
export async function authenticateGateway(
  key: string,
): Promise<GatewayPrincipal | null> {
  const [row] = await db
    .select({
      organizationId: gateways.organizationId,
      gatewayId: gateways.id,
      name: gateways.name,
    })
    .from(gateways)
    .where(
      and(eq(gateways.keyHash, hashToken(key)), isNull(gateways.revokedAt)),
    );
  if (!row) return null;
  const now = new Date();
  await db
    .update(gateways)
    .set({ lastSeenAt: now })
    .where(
      and(
        eq(gateways.organizationId, row.organizationId),
        eq(gateways.id, row.gatewayId),
        or(
          isNull(gateways.lastSeenAt),
          lt(
            gateways.lastSeenAt,
            new Date(now.getTime() - LAST_SEEN_RESOLUTION_MS),
          ),
        ),
      ),
    );
  return { kind: "gateway", ...row };
}
