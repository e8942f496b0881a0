import type { Request, Response, NextFunction } from "express";
import {
  latestIntervalHour,
  listIntervals,
} from "~/ingest/list-intervals.server";
import type { Database } from "~/db/client.server";
import { withReadSource } from "~/db/read-source.server";
import { isUuid } from "~/lib/ids";
import { getMeter } from "~/sites/meters.server";
import { sendError, sendValidationError } from "./respond.server";
import {
  intervalsQuerySchema,
  type Interval,
  type IntervalPage,
} from "./schemas";

type MeterRow = NonNullable<Awaited<ReturnType<typeof getMeter>>>;

/** At most a quarter's rows per request keeps pages and memory small. */
const MAX_RANGE_MS = 93 * 86_400_000;

const rangeSchema = intervalsQuerySchema.transform((q) => ({
  from: q.from ? new Date(q.from) : null,
  to: q.to ? new Date(q.to) : null,
}));

type RangeRead =
  | { error: [code: string, message: string] }
  | { from: Date; to: Date; latest: Date | null; intervals: Interval[] };

/** The asked range (by default the week up to the latest interval) and its rows. */
async function readRange(
  readDb: Database,
  { organizationId, meter }: { organizationId: string; meter: MeterRow },
  asked: { from: Date | null; to: Date | null },
): Promise<RangeRead> {
  const meterId = meter.id;
  const latest = await latestIntervalHour({ organizationId, meterId }, readDb);
  const to =
    asked.to ??
    new Date((latest ?? new Date()).getTime() + meter.intervalMinutes * 60_000);
  const from = asked.from ?? new Date(to.getTime() - 7 * 86_400_000);
  if (to <= from) return { error: ["invalid_range", "to must be after from."] };
  if (to.getTime() - from.getTime() > MAX_RANGE_MS)
    return { error: ["range_too_long", "Ask for at most 93 days at a time."] };
  const intervals = await listIntervals(
    { organizationId, meterId, from, to },
    readDb,
  );
  return { from, to, latest, intervals };
}

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
    // Both reads from one source (the standby unless this person has just
    // written), so `latest` and the rows agree.
    const read = await withReadSource(req.headers.cookie, (source) =>
      readRange(source.db, { organizationId, meter }, parsed.data),
    );
    if ("error" in read) return sendError(res, 400, ...read.error);
    const { from, to, latest, intervals } = read;
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
