/**
 * Energy baselines of a site and carrier: fitted on the months of a baseline
 * period that have complete weather and a ledger entry, saved with their
 * data and statistics so later changes to readings or weather never alter a
 * saved baseline silently.
 */
import { and, desc, eq } from "drizzle-orm";
import { recordAuditWith } from "~/audit/record-audit.server";
import { db, pool } from "~/db/client.server";
import { baselines, users, type Carrier } from "~/db/schema";
import { joinMonths, pointsIn, type MonthFigure } from "./analysis";
import type { DegreeDayDriver } from "./degree-days";
import { siteMonthlyEnergy } from "./energy.server";
import { fitBaseline, type FitOutcome, type StoredModel } from "./regression";
import { siteMonthlyDegreeDays } from "./weather.server";

export interface SiteRef {
  id: string;
  degreeDayBaseC: string;
}

/** Months from `from` to `to` with degree days (to `baseC`) and energy. */
export async function siteMonths(args: {
  organizationId: string;
  siteId: string;
  carrier: Carrier;
  driver: DegreeDayDriver;
  baseC: number;
  from: string;
  to: string;
}): Promise<MonthFigure[]> {
  const [degreeDays, energy] = await Promise.all([
    siteMonthlyDegreeDays(args),
    siteMonthlyEnergy(args),
  ]);
  return joinMonths(degreeDays, energy, args.driver);
}

/** OLS of monthly energy on monthly degree days over a baseline period. */
export async function fitSiteBaseline(args: {
  organizationId: string;
  site: SiteRef;
  carrier: Carrier;
  driver: DegreeDayDriver;
  from: string;
  to: string;
}): Promise<{
  points: ReturnType<typeof pointsIn>;
  outcome: FitOutcome;
  baseC: number;
}> {
  const baseC = Number(args.site.degreeDayBaseC);
  const months = await siteMonths({
    ...args,
    siteId: args.site.id,
    baseC,
  });
  const points = pointsIn(months, args);
  return { points, outcome: fitBaseline(points), baseC };
}

function lastDayOf(month: string): string {
  const [y, m] = month.split("-").map(Number);
  return new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
}

export type SaveOutcome =
  { ok: true; id: string } | { ok: false; reason: string };

/** Fits on the server's own figures and saves the model, with an audit entry. */
export async function saveBaseline(args: {
  organizationId: string;
  actorUserId: string;
  site: SiteRef;
  carrier: Carrier;
  driver: DegreeDayDriver;
  from: string;
  to: string;
}): Promise<SaveOutcome> {
  const { points, outcome, baseC } = await fitSiteBaseline(args);
  if (!outcome.ok) return outcome;
  const model: StoredModel = {
    ...outcome.model,
    method: "ols",
    driver: args.driver,
    baseC,
    granularity: "monthly",
    points,
  };
  const client = await pool.connect();
  try {
    await client.query("begin");
    const { rows } = await client.query<{ id: string }>(
      `insert into baselines (organization_id, site_id, carrier, period_from, period_to, granularity, model, created_by_user_id)
       values ($1, $2, $3, $4, $5, 'monthly', $6, $7) returning id`,
      [
        args.organizationId,
        args.site.id,
        args.carrier,
        `${args.from}-01`,
        lastDayOf(args.to),
        JSON.stringify(model),
        args.actorUserId,
      ],
    );
    const id = rows[0].id;
    await recordAuditWith(client, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "baseline.saved",
      subject: id,
      siteId: args.site.id,
      after: {
        carrier: args.carrier,
        from: args.from,
        to: args.to,
        driver: args.driver,
        slope: model.slope,
        intercept: model.intercept,
        n: model.n,
      },
    });
    await client.query("commit");
    return { ok: true, id };
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}

export interface SavedBaseline {
  id: string;
  siteId: string;
  carrier: Carrier;
  /** YYYY-MM */
  from: string;
  to: string;
  granularity: "monthly" | "daily";
  model: StoredModel;
  createdAt: Date;
  createdBy: string | null;
}

const columns = {
  id: baselines.id,
  siteId: baselines.siteId,
  carrier: baselines.carrier,
  periodFrom: baselines.periodFrom,
  periodTo: baselines.periodTo,
  granularity: baselines.granularity,
  model: baselines.model,
  createdAt: baselines.createdAt,
  createdBy: users.name,
};

function toSaved(row: {
  id: string;
  siteId: string;
  carrier: Carrier;
  periodFrom: string;
  periodTo: string;
  granularity: string;
  model: Record<string, unknown>;
  createdAt: Date;
  createdBy: string | null;
}): SavedBaseline {
  return {
    id: row.id,
    siteId: row.siteId,
    carrier: row.carrier,
    from: row.periodFrom.slice(0, 7),
    to: row.periodTo.slice(0, 7),
    granularity: row.granularity === "daily" ? "daily" : "monthly",
    model: row.model as unknown as StoredModel,
    createdAt: row.createdAt,
    createdBy: row.createdBy,
  };
}

/** A site's saved baselines, newest first; of one carrier if given. */
export async function listBaselines(args: {
  organizationId: string;
  siteId: string;
  carrier?: Carrier;
}): Promise<SavedBaseline[]> {
  const rows = await db
    .select(columns)
    .from(baselines)
    .leftJoin(users, eq(users.id, baselines.createdByUserId))
    .where(
      and(
        eq(baselines.organizationId, args.organizationId),
        eq(baselines.siteId, args.siteId),
        args.carrier ? eq(baselines.carrier, args.carrier) : undefined,
      ),
    )
    .orderBy(desc(baselines.createdAt));
  return rows.map(toSaved);
}

export async function getBaseline(args: {
  organizationId: string;
  id: string;
}): Promise<SavedBaseline | null> {
  const [row] = await db
    .select(columns)
    .from(baselines)
    .leftJoin(users, eq(users.id, baselines.createdByUserId))
    .where(
      and(
        eq(baselines.organizationId, args.organizationId),
        eq(baselines.id, args.id),
      ),
    );
  return row ? toSaved(row) : null;
}
