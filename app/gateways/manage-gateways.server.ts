import { and, eq, isNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { gateways } from "~/db/schema";
import { recordAudit } from "~/audit/record-audit.server";
import { gatewayKeyPrefix, newGatewayKey } from "~/auth/gateway-keys.server";
import { hashToken } from "~/auth/tokens.server";

/** Creates a gateway; the key is returned this once and stored only hashed. */
export async function createGateway(args: {
  organizationId: string;
  actorUserId: string;
  name: string;
}) {
  const key = newGatewayKey();
  const id = await db.transaction(async (tx) => {
    const [gateway] = await tx
      .insert(gateways)
      .values({
        organizationId: args.organizationId,
        name: args.name,
        keyHash: hashToken(key),
        keyPrefix: gatewayKeyPrefix(key),
      })
      .returning({ id: gateways.id });
    // The key itself is never recorded: only the prefix that tells keys apart.
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "gateway.created",
      subject: gateway.id,
      after: {
        name: args.name,
        keyPrefix: gatewayKeyPrefix(key),
        state: "active",
      },
    });
    return gateway.id;
  });
  return { id, key };
}

export async function revokeGateway(args: {
  organizationId: string;
  actorUserId: string;
  gatewayId: string;
}) {
  return db.transaction(async (tx) => {
    const revoked = await tx
      .update(gateways)
      .set({ revokedAt: new Date() })
      .where(
        and(
          eq(gateways.organizationId, args.organizationId),
          eq(gateways.id, args.gatewayId),
          isNull(gateways.revokedAt),
        ),
      )
      .returning({ name: gateways.name, keyPrefix: gateways.keyPrefix });
    if (revoked.length === 0) return false;
    const [{ name, keyPrefix }] = revoked;
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "gateway.revoked",
      subject: args.gatewayId,
      before: { name, keyPrefix, state: "active" },
      after: { name, keyPrefix, state: "revoked" },
    });
    return true;
  });
}
