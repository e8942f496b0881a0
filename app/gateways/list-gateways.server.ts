import { asc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { gateways } from "~/db/schema";

export async function listGateways({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({
      id: gateways.id,
      name: gateways.name,
      keyPrefix: gateways.keyPrefix,
      lastSeenAt: gateways.lastSeenAt,
      revokedAt: gateways.revokedAt,
    })
    .from(gateways)
    .where(eq(gateways.organizationId, organizationId))
    .orderBy(asc(gateways.name));
}
