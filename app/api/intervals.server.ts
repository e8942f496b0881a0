import type { Request, Response, NextFunction } from "express";
import {
  latestIntervalHour,
  listIntervals,
} from "~/ingest/list-intervals.server";
import { isUuid } from "~/lib/ids";
import { getMeter } from "~/sites/meters.server";
import { sendError, sendValidationError } from "./respond.server";
import { intervalsQuerySchema, type IntervalPage } from "./schemas";

/** At most a quarter's rows per request keeps pages and memory small. */
const MAX_RANGE_MS = 93 * 86_400_000;

const rangeSchema = intervalsQuerySchema.transform((q) => ({
  from: q.from ? new Date(q.from) : null,
  to: q.to ? new Date(q.to) : null,
}));

/** GET /api/v1/orgs/:orgId/meters/:meterId/intervals?from&to */
export async function getIntervals(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const { organizationId } = res.locals.member!;
    const meterId = String(req.params.meterId);
    if (!isUuid(meterId))
      return sendError(res, 404, "not_found", "No such meter.");
    const meter = await getMeter({ organizationId, meterId });
    if (!meter) return sendError(res, 404, "not_found", "No such meter.");
    const parsed = rangeSchema.safeParse(req.query);
    if (!parsed.success) return sendValidationError(res, parsed.error);
    const latest = await latestIntervalHour({ organizationId, meterId });
    const to =
      parsed.data.to ??
      new Date(
        (latest ?? new Date()).getTime() + meter.intervalMinutes * 60_000,
      );
    const from = parsed.data.from ?? new Date(to.getTime() - 7 * 86_400_000);
    if (to <= from)
      return sendError(res, 400, "invalid_range", "to must be after from.");
    if (to.getTime() - from.getTime() > MAX_RANGE_MS) {
      return sendError(
        res,
        400,
        "range_too_long",
        "Ask for at most 93 days at a time.",
      );
    }
    const intervals = await listIntervals({
      organizationId,
      meterId,
      from,
      to,
    });
    const page: IntervalPage = {
      meter: {
        id: meter.id,
        code: meter.code,
        name: meter.name,
        carrier: meter.carrier,
        orientation: meter.orientation,
        interval_minutes: meter.intervalMinutes,
        time_zone: meter.timeZone,
      },
      from: from.toISOString(),
      to: to.toISOString(),
      latest: latest?.toISOString() ?? null,
      intervals,
    };
    res.json(page);
  } catch (error) {
    next(error);
  }
}
