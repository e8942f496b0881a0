import { eq, sql } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { createUser } from "../app/auth/create-user.server";
import { gatewayKeyPrefix } from "../app/auth/gateway-keys.server";
import { hashToken } from "../app/auth/tokens.server";
import * as schema from "../app/db/schema";
import {
  DEFAULT_DEMO_GATEWAY_KEY,
  DEMO_PASSWORD,
  HOLLOWMEAD,
  LARCHMERE,
  demoPeople,
} from "./demo-people";

type Db = NodePgDatabase<typeof schema>;

const DEMO_SEED_LOCK = 4_2026_1201;

/**
 * Creates the demo organisations, people and gateway in one transaction.
 * Returns false without writing when the demo is already there.
 */
export async function seedDemo(
  db: Db,
  gatewayKey = DEFAULT_DEMO_GATEWAY_KEY,
): Promise<boolean> {
  return db.transaction(async (tx) => {
    // Two seeders at once (two test projects, two terminals) must not both
    // find the database empty: the second waits here and then sees the demo.
    await tx.execute(sql`select pg_advisory_xact_lock(${DEMO_SEED_LOCK})`);
    const [existing] = await tx
      .select({ id: schema.organizations.id })
      .from(schema.organizations)
      .where(eq(schema.organizations.name, LARCHMERE));
    if (existing) return false;

    const orgIds = new Map<string, string>();
    for (const name of [LARCHMERE, HOLLOWMEAD]) {
      const [org] = await tx
        .insert(schema.organizations)
        .values({ name })
        .returning();
      orgIds.set(name, org.id);
    }
    for (const person of demoPeople) {
      const userId = await createUser(tx, {
        ...person,
        password: DEMO_PASSWORD,
      });
      for (const m of person.memberships) {
        await tx.insert(schema.memberships).values({
          organizationId: orgIds.get(m.organization)!,
          userId,
          role: m.role,
        });
      }
    }
    await tx.insert(schema.gateways).values({
      organizationId: orgIds.get(LARCHMERE)!,
      name: "Larchmere demo gateway",
      keyHash: hashToken(gatewayKey),
      keyPrefix: gatewayKeyPrefix(gatewayKey),
    });
    return true;
  });
}
