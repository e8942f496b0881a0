/**
 * Energy baselines of a site and carrier: fitted on the months of a baseline
 * period that have complete weather and a ledger entry, saved with their
 * data and statistics so later changes to readings or weather never alter a
 * saved baseline silently.
 */
import { and, desc, eq, type SQL } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { baselines, users } from "~/db/schema";
import type { Carrier } from "~/sites/meter-kinds";
import { joinMonths, pointsIn, type MonthFigure } from "./analysis";
import type { DegreeDayDriver } from "./degree-days";
import { siteMonthlyEnergy } from "./energy.server";
import { fitBaseline, type FitOutcome, type StoredModel } from "./regression";
import { lastDayOf, siteMonthlyDegreeDays } from "./weather.server";

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
  return db.transaction(async (tx) => {
    const [saved] = await tx
      .insert(baselines)
      .values({
        organizationId: args.organizationId,
        siteId: args.site.id,
        carrier: args.carrier,
        periodFrom: `${args.from}-01`,
        periodTo: lastDayOf(args.to),
        granularity: "monthly",
        model: { ...model },
        createdByUserId: args.actorUserId,
      })
      .returning({ id: baselines.id });
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "baseline.saved",
      subject: saved.id,
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
    return { ok: true, id: saved.id };
  });
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

/** Saved baselines with the name of who saved them, of the rows `where` picks. */
function selectBaselines(where: SQL | undefined) {
  return db
    .select(columns)
    .from(baselines)
    .leftJoin(users, eq(users.id, baselines.createdByUserId))
    .where(where);
}

/** A site's saved baselines, newest first; of one carrier if given. */
export async function listBaselines(args: {
  organizationId: string;
  siteId: string;
  carrier?: Carrier;
}): Promise<SavedBaseline[]> {
  const rows = await selectBaselines(
    and(
      eq(baselines.organizationId, args.organizationId),
      eq(baselines.siteId, args.siteId),
      args.carrier ? eq(baselines.carrier, args.carrier) : undefined,
    ),
  ).orderBy(desc(baselines.createdAt));
  return rows.map(toSaved);
}

export async function getBaseline(args: {
  organizationId: string;
  id: string;
}): Promise<SavedBaseline | null> {
  const [row] = await selectBaselines(
    and(
      eq(baselines.organizationId, args.organizationId),
      eq(baselines.id, args.id),
    ),
  );
  return row ? toSaved(row) : null;
}
