/**
 * Tariffs and their versions: reading them, adding a supply's tariff and a
 * new version. Every write checks what the schema cannot (the supply belongs
 * to the organisation, versions do not overlap), prices the months the
 * change touches in the same transaction (costs.server.ts), and is audited.
 */
import { and, asc, eq, sql } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db, type Transaction } from "~/db/client.server";
import { isUniqueViolation } from "~/db/errors.server";
import { meters, sites, tariffs, tariffVersions } from "~/db/schema";
import { recomputeTariffMonths } from "./costs.server";
import {
  tariffRatesSchema,
  type Tariff,
  type TariffInput,
  type TariffVersionInput,
} from "./tariff-schema";

export type WriteOutcome =
  | { ok: true; tariff: Tariff }
  | { ok: false; status: 400 | 404 | 409; reason: string; field?: string };

export interface Actor {
  organizationId: string;
  actorUserId: string | null;
  actorTokenId?: string | null;
}

class Refused extends Error {
  constructor(
    readonly status: 400 | 404 | 409,
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

export async function listTariffs(organizationId: string): Promise<Tariff[]> {
  const heads = await db
    .select({
      id: tariffs.id,
      name: tariffs.name,
      site_id: tariffs.siteId,
      site_name: sites.name,
      carrier: tariffs.carrier,
      meter_id: tariffs.meterId,
      meter_code: meters.code,
      currency: tariffs.currency,
      illustrative: tariffs.illustrative,
    })
    .from(tariffs)
    .innerJoin(
      sites,
      and(
        eq(sites.organizationId, tariffs.organizationId),
        eq(sites.id, tariffs.siteId),
      ),
    )
    .leftJoin(
      meters,
      and(
        eq(meters.organizationId, tariffs.organizationId),
        eq(meters.id, tariffs.meterId),
      ),
    )
    .where(eq(tariffs.organizationId, organizationId))
    .orderBy(asc(sites.name), asc(tariffs.carrier), asc(tariffs.name));
  const versions = await db
    .select()
    .from(tariffVersions)
    .where(eq(tariffVersions.organizationId, organizationId))
    .orderBy(asc(tariffVersions.validFrom));
  return heads.map((h) => ({
    ...h,
    meter_code: h.meter_code ?? null,
    versions: versions
      .filter((v) => v.tariffId === h.id)
      .map((v) => ({
        id: v.id,
        valid_from: v.validFrom,
        valid_to: v.validTo,
        rates: tariffRatesSchema.parse(v.rates),
        created_at: v.createdAt.toISOString(),
      })),
  }));
}

export async function getTariff(
  organizationId: string,
  tariffId: string,
): Promise<Tariff | null> {
  return (
    (await listTariffs(organizationId)).find((t) => t.id === tariffId) ?? null
  );
}

/** The supply must be the organisation's: a boundary meter of the site and carrier, or the site itself. */
async function checkSupply(tx: Transaction, actor: Actor, input: TariffInput) {
  const [site] = await tx
    .select({ id: sites.id })
    .from(sites)
    .where(
      and(
        eq(sites.organizationId, actor.organizationId),
        eq(sites.id, input.site_id),
      ),
    );
  if (!site) throw new Refused(400, "No such site.", "site_id");
  if (input.meter_id !== null) {
    const [meter] = await tx
      .select()
      .from(meters)
      .where(
        and(
          eq(meters.organizationId, actor.organizationId),
          eq(meters.id, input.meter_id),
        ),
      );
    if (!meter || meter.siteId !== input.site_id)
      throw new Refused(400, "No such meter at this site.", "meter_id");
    if (meter.carrier !== input.carrier)
      throw new Refused(400, "The meter measures another carrier.", "carrier");
    if (meter.parentMeterId !== null || meter.position !== "boundary")
      throw new Refused(
        400,
        "A sub-meter is inside the boundary: its energy is not bought, so it has no tariff.",
        "meter_id",
      );
  }
  const others = await tx
    .select({ currency: tariffs.currency })
    .from(tariffs)
    .where(
      and(
        eq(tariffs.organizationId, actor.organizationId),
        eq(tariffs.siteId, input.site_id),
        eq(tariffs.carrier, input.carrier),
      ),
    );
  if (others.some((o) => o.currency !== input.currency))
    throw new Refused(
      400,
      `The site's other ${input.carrier} tariffs are in ${others[0].currency}: one ledger row has one currency.`,
      "currency",
    );
}

function dayBefore(day: string): string {
  const t = Date.parse(`${day}T00:00:00Z`) - 86_400_000;
  return new Date(t).toISOString().slice(0, 10);
}

/**
 * Refuses a version that overlaps another. A version without an end that
 * started before the new one is ended the day before it instead: that is
 * how a tariff changes. Returns the month from which costs change.
 */
async function placeVersion(
  tx: Transaction,
  actor: Actor,
  tariffId: string,
  input: TariffVersionInput,
): Promise<void> {
  const existing = await tx
    .select()
    .from(tariffVersions)
    .where(
      and(
        eq(tariffVersions.organizationId, actor.organizationId),
        eq(tariffVersions.tariffId, tariffId),
      ),
    )
    .orderBy(asc(tariffVersions.validFrom));
  const newEnd = input.valid_to ?? "9999-12-31";
  for (const v of existing) {
    const openBefore = v.validTo === null && v.validFrom < input.valid_from;
    if (openBefore) continue;
    const end = v.validTo ?? "9999-12-31";
    if (v.validFrom <= newEnd && input.valid_from <= end)
      throw new Refused(
        400,
        `Overlaps the version valid from ${v.validFrom}${v.validTo ? ` to ${v.validTo}` : ""}: versions must not overlap.`,
        "valid_from",
      );
  }
  for (const v of existing) {
    if (v.validTo === null && v.validFrom < input.valid_from)
      await tx
        .update(tariffVersions)
        .set({ validTo: dayBefore(input.valid_from) })
        .where(
          and(
            eq(tariffVersions.organizationId, actor.organizationId),
            eq(tariffVersions.id, v.id),
          ),
        );
  }
  await tx.insert(tariffVersions).values({
    organizationId: actor.organizationId,
    tariffId,
    validFrom: input.valid_from,
    validTo: input.valid_to,
    rates: input.rates,
    createdByUserId: actor.actorUserId,
  });
}

/** Prices again every tariff of the site and carrier (a new meter tariff takes its meter from the site's). */
async function repriceSupply(
  tx: Transaction,
  actor: Actor,
  siteId: string,
  carrier: string,
  fromMonth: string,
  reason: string,
) {
  const all = await tx.execute<{ id: string }>(
    sql`select id from tariffs where organization_id = ${actor.organizationId}
          and site_id = ${siteId} and carrier::text = ${carrier} order by id`,
  );
  for (const { id } of all.rows)
    await recomputeTariffMonths(tx, actor.organizationId, id, fromMonth, null, {
      source: "tariff",
      reason,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId,
    });
}

async function outcomeOf(
  actor: Actor,
  write: () => Promise<string>,
): Promise<WriteOutcome> {
  try {
    const tariffId = await write();
    const tariff = await getTariff(actor.organizationId, tariffId);
    return { ok: true, tariff: tariff! };
  } catch (error) {
    if (error instanceof Refused)
      return {
        ok: false,
        status: error.status,
        reason: error.message,
        field: error.field,
      };
    if (isUniqueViolation(error))
      return {
        ok: false,
        status: 409,
        reason:
          "This supply already has a tariff: add a version to it instead.",
      };
    throw error;
  }
}

export async function createTariff(
  actor: Actor,
  input: TariffInput,
): Promise<WriteOutcome> {
  return outcomeOf(actor, () =>
    db.transaction(async (tx) => {
      await checkSupply(tx, actor, input);
      const [tariff] = await tx
        .insert(tariffs)
        .values({
          organizationId: actor.organizationId,
          name: input.name,
          siteId: input.site_id,
          carrier: input.carrier,
          meterId: input.meter_id,
          currency: input.currency,
          illustrative: input.illustrative,
        })
        .returning({ id: tariffs.id });
      await placeVersion(tx, actor, tariff.id, input.first_version);
      await recordAudit(tx, {
        organizationId: actor.organizationId,
        actorUserId: actor.actorUserId,
        actorTokenId: actor.actorTokenId ?? null,
        action: "tariff.created",
        subject: tariff.id,
        siteId: input.site_id,
        meterId: input.meter_id,
        after: {
          name: input.name,
          carrier: input.carrier,
          currency: input.currency,
          validFrom: input.first_version.valid_from,
        },
      });
      await repriceSupply(
        tx,
        actor,
        input.site_id,
        input.carrier,
        input.first_version.valid_from.slice(0, 7),
        `Tariff "${input.name}" added`,
      );
      return tariff.id;
    }),
  );
}

export async function addTariffVersion(
  actor: Actor,
  tariffId: string,
  input: TariffVersionInput,
): Promise<WriteOutcome> {
  return outcomeOf(actor, () =>
    db.transaction(async (tx) => {
      // The tariff's row lock: two versions added at once are placed one after the other.
      const [tariff] = await tx
        .select()
        .from(tariffs)
        .where(
          and(
            eq(tariffs.organizationId, actor.organizationId),
            eq(tariffs.id, tariffId),
          ),
        )
        .for("update");
      if (!tariff) throw new Refused(404, "No such tariff.");
      await placeVersion(tx, actor, tariffId, input);
      await recordAudit(tx, {
        organizationId: actor.organizationId,
        actorUserId: actor.actorUserId,
        actorTokenId: actor.actorTokenId ?? null,
        action: "tariff.version_added",
        subject: tariffId,
        siteId: tariff.siteId,
        meterId: tariff.meterId,
        after: {
          validFrom: input.valid_from,
          validTo: input.valid_to,
          rates: input.rates,
        },
      });
      await repriceSupply(
        tx,
        actor,
        tariff.siteId,
        tariff.carrier,
        input.valid_from.slice(0, 7),
        `Tariff "${tariff.name}" changed from ${input.valid_from}`,
      );
      return tariffId;
    }),
  );
}

/** The supplies bought across a boundary that have no tariff yet: a site and carrier each. */
export async function untariffedSupplies(
  organizationId: string,
): Promise<{ siteId: string; siteName: string; carrier: string }[]> {
  const { rows } = await db.execute<{
    site_id: string;
    site_name: string;
    carrier: string;
  }>(
    sql`select distinct s.id as site_id, s.name as site_name, m.carrier::text as carrier
          from meters m join sites s on s.organization_id = m.organization_id and s.id = m.site_id
         where m.organization_id = ${organizationId} and m.parent_meter_id is null
           and m.position = 'boundary' and s.archived_at is null
           and not exists (select 1 from tariffs t where t.organization_id = m.organization_id
                             and t.site_id = m.site_id and t.carrier = m.carrier and t.meter_id is null)
         order by site_name, carrier`,
  );
  return rows.map((r) => ({
    siteId: r.site_id,
    siteName: r.site_name,
    carrier: r.carrier,
  }));
}
