/**
 * The demo's illustrative tariffs (seeds/scenario/larchmere-tariffs.ts), put
 * in through the same code as the Tariffs page, so each supply's months are
 * priced from their intervals. Run after the readings and before the first
 * year's months are closed; an estate that already has tariffs is left alone.
 */
import { and, eq } from "drizzle-orm";
import { db } from "../app/db/client.server";
import { sites, tariffs, users } from "../app/db/schema";
import { addTariffVersion, createTariff } from "../app/tariffs/tariffs.server";
import { SCENARIO_TARIFFS } from "./scenario/larchmere-tariffs";

export async function seedTariffs(organizationId: string): Promise<void> {
  const [existing] = await db
    .select({ id: tariffs.id })
    .from(tariffs)
    .where(eq(tariffs.organizationId, organizationId))
    .limit(1);
  if (existing) return;
  const [manager] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "manager@larchmere.example"));
  const actor = { organizationId, actorUserId: manager?.id ?? null };
  const started = Date.now();
  for (const t of SCENARIO_TARIFFS) {
    const [site] = await db
      .select({ id: sites.id })
      .from(sites)
      .where(
        and(
          eq(sites.organizationId, organizationId),
          eq(sites.name, t.siteName),
        ),
      );
    const [first, ...later] = t.versions;
    const created = await createTariff(actor, {
      name: t.name,
      site_id: site.id,
      carrier: t.carrier,
      meter_id: null,
      currency: "GBP",
      illustrative: true,
      first_version: {
        valid_from: first.validFrom,
        valid_to: null,
        rates: first.rates,
      },
    });
    if (!created.ok)
      throw new Error(`demo tariff ${t.name}: ${created.reason}`);
    for (const v of later) {
      const added = await addTariffVersion(actor, created.tariff.id, {
        valid_from: v.validFrom,
        valid_to: null,
        rates: v.rates,
      });
      if (!added.ok) throw new Error(`demo tariff ${t.name}: ${added.reason}`);
    }
  }
  console.log(
    `[joulebook] demo tariffs: ${SCENARIO_TARIFFS.length} supplies priced (${Math.round((Date.now() - started) / 1000)} s)`,
  );
}
