import { eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import * as schema from "../../app/db/schema";
import { hashPassword } from "../../app/auth/password.server";
import type { Role } from "../../app/auth/permissions";
import { randomUUID } from "node:crypto";

/** Direct database access for arranging and checking test state. */
export const pool = new pg.Pool({
  connectionString: process.env.DATABASE_URL,
  max: 2,
});
// The database-outage test stops the cluster: a lost idle connection must
// not end the test process.
pool.on("error", () => {});
export const db = drizzle(pool, { schema });
export { schema };

export async function organizationId(name: string): Promise<string> {
  const [org] = await db
    .select({ id: schema.organizations.id })
    .from(schema.organizations)
    .where(eq(schema.organizations.name, name));
  if (!org) throw new Error(`no organisation ${name}`);
  return org.id;
}

export async function userIdByEmail(email: string): Promise<string> {
  const [user] = await db
    .select({ id: schema.users.id })
    .from(schema.users)
    .where(eq(schema.users.email, email));
  if (!user) throw new Error(`no user ${email}`);
  return user.id;
}

/** A fresh organisation with one member per requested role, for tests that change things. */
export async function createOrganization(
  roles: Role[],
  password = "test-password-123",
) {
  const tag = randomUUID().slice(0, 8);
  const [org] = await db
    .insert(schema.organizations)
    .values({ name: `Test org ${tag}` })
    .returning();
  const passwordHash = await hashPassword(password);
  const members = [];
  for (const [i, role] of roles.entries()) {
    const id = randomUUID();
    const email = `${role}-${i}-${tag}@test.example`;
    await db
      .insert(schema.users)
      .values({ id, email, name: `${role} ${i} ${tag}`, passwordHash });
    await db
      .insert(schema.memberships)
      .values({ organizationId: org.id, userId: id, role });
    members.push({ id, email, role, password });
  }
  return { id: org.id, name: org.name, members };
}

export async function roleOf(
  organizationId: string,
  userId: string,
): Promise<Role | null> {
  const rows = await db
    .select({
      role: schema.memberships.role,
      org: schema.memberships.organizationId,
    })
    .from(schema.memberships)
    .where(eq(schema.memberships.userId, userId));
  return rows.find((r) => r.org === organizationId)?.role ?? null;
}
