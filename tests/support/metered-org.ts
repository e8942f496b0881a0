/**
 * A fresh organisation with a site, the usual kinds of meter and an active
 * gateway, arranged directly in the database (tests/support/db.ts), for tests
 * that post readings and must not touch the demo estate.
 *
 *   const org = await createMeteredOrg();
 *   await client.postJson("/api/v1/readings", { readings: [
 *     { meter: org.meters.water.code, quantity: "water_heat", ... },
 *   ] }, { authorization: `Bearer ${org.gatewayKey}` });
 *
 * Every call makes new codes (`W-<tag>`, `E-<tag>`, `X-<tag>`) and a new key,
 * so tests never share meters or rate-limit buckets. Meters are installed on
 * 2020-01-01 (UTC): readings before that are rejected as "not installed".
 */
import { randomBytes, randomUUID } from "node:crypto";
import type { Role } from "../../app/auth/permissions";
import { gatewayKeyPrefix } from "../../app/auth/gateway-keys.server";
import { hashToken } from "../../app/auth/tokens.server";
import { createOrganization, db, schema } from "./db";

export const METERS_INSTALLED_AT = new Date("2020-01-01T00:00:00Z");

export interface MeterRef {
  id: string;
  /** What gateways put in a reading's `meter` field. */
  code: string;
}

export interface MeteredOrg {
  /** As createOrganization returns it: id, name and one member per role. */
  org: Awaited<ReturnType<typeof createOrganization>>;
  siteId: string;
  meters: {
    /**
     * `W-<tag>`: water_heat, heat, import; sensor in the return pipe and a
     * default pressure of 6 bar abs, so readings may leave both out.
     */
    water: MeterRef;
    /** `E-<tag>`: electric_register, electricity, import; rolls over at 100,000 kWh, multiplier 1. */
    register: MeterRef;
    /** `X-<tag>`: electric_register, electricity, export (rooftop solar to the grid). */
    export: MeterRef;
  };
  gatewayId: string;
  /** The plain key (`jbgw_…`), to send as `Authorization: Bearer <key>`. */
  gatewayKey: string;
  /** The suffix of this call's meter codes. */
  tag: string;
}

export interface MeteredOrgOptions {
  /** Members to create, one per role; an owner by default. */
  roles?: Role[];
  /** Site time zone; Europe/London by default. */
  timeZone?: string;
}

export async function createMeteredOrg(
  options: MeteredOrgOptions = {},
): Promise<MeteredOrg> {
  const org = await createOrganization(options.roles ?? ["owner"]);
  const tag = randomUUID().slice(0, 8);

  const [site] = await db
    .insert(schema.sites)
    .values({
      organizationId: org.id,
      name: `Test site ${tag}`,
      timeZone: options.timeZone ?? "Europe/London",
    })
    .returning({ id: schema.sites.id });

  const common = {
    organizationId: org.id,
    siteId: site.id,
    installedAt: METERS_INSTALLED_AT,
  };
  const rows = await db
    .insert(schema.meters)
    .values([
      {
        ...common,
        code: `W-${tag}`,
        name: `Heat meter ${tag}`,
        quantity: "water_heat",
        carrier: "heat",
        orientation: "import",
        sensorAt: "return",
        defaultPressureBarAbs: "6",
      },
      {
        ...common,
        code: `E-${tag}`,
        name: `Electricity register ${tag}`,
        quantity: "electric_register",
        carrier: "electricity",
        orientation: "import",
        multiplier: "1",
        rolloverKwh: "100000",
      },
      {
        ...common,
        code: `X-${tag}`,
        name: `Solar export ${tag}`,
        quantity: "electric_register",
        carrier: "electricity",
        orientation: "export",
      },
    ])
    .returning({ id: schema.meters.id, code: schema.meters.code });
  const byCode = (code: string): MeterRef => {
    const row = rows.find((r) => r.code === code);
    if (!row) throw new Error(`meter ${code} was not created`);
    return row;
  };

  const gatewayKey = `jbgw_${randomBytes(32).toString("base64url")}`;
  const [gateway] = await db
    .insert(schema.gateways)
    .values({
      organizationId: org.id,
      name: `Test gateway ${tag}`,
      keyHash: hashToken(gatewayKey),
      keyPrefix: gatewayKeyPrefix(gatewayKey),
    })
    .returning({ id: schema.gateways.id });

  return {
    org,
    siteId: site.id,
    meters: {
      water: byCode(`W-${tag}`),
      register: byCode(`E-${tag}`),
      export: byCode(`X-${tag}`),
    },
    gatewayId: gateway.id,
    gatewayKey,
    tag,
  };
}

/**
 * Adds a chilled-water meter (water_heat, cooling, import; `C-<tag>` unless
 * another code is given) on the org's site, sensor in the return pipe, 4 bar
 * abs by default. Its readings come out negative from the physics (flow
 * colder than return).
 */
export async function addCoolingMeter(
  org: MeteredOrg,
  code = `C-${org.tag}`,
): Promise<MeterRef> {
  const [meter] = await db
    .insert(schema.meters)
    .values({
      organizationId: org.org.id,
      siteId: org.siteId,
      installedAt: METERS_INSTALLED_AT,
      code,
      name: `Chilled water ${code}`,
      quantity: "water_heat",
      carrier: "cooling",
      orientation: "import",
      sensorAt: "return",
      defaultPressureBarAbs: "4",
    })
    .returning({ id: schema.meters.id, code: schema.meters.code });
  return meter;
}
