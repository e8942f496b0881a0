/**
 * Sites and meters over the JSON API: list, read, create, update, archive.
 * The bodies are snake_case JSON; each is turned into the fields the pages'
 * forms send and checked with the pages' own schemas (site-schema.ts,
 * meter-schema.ts), so the API and the pages can never accept different
 * things. Writes go through the same data access as the pages, which records
 * the audit entries.
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import type { z } from "zod";
import { isUuid } from "~/lib/ids";
import {
  meterFormSchema,
  retireSchema,
  type MeterInput,
} from "~/sites/meter-schema";
import {
  createMeter,
  getMeter,
  listAllMeters,
  listSiteMeters,
  MeterRuleError,
  ResolutionFixedError,
  retireMeter,
  updateMeter,
} from "~/sites/meters.server";
import { siteFormSchema, type SiteInput } from "~/sites/site-schema";
import {
  archiveSite,
  createSite,
  DuplicateNameError,
  getSite,
  listSites,
  updateSite,
} from "~/sites/sites.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError, zodIssues } from "./respond.server";
import {
  meterArchiveBodySchema,
  meterCreateBodySchema,
  meterListQuerySchema,
  meterUpdateBodySchema,
  siteCreateBodySchema,
  siteUpdateBodySchema,
  type ApiMeter,
  type ApiSite,
} from "./schemas";

type Handler = (req: Request, res: Response) => Promise<void>;

/** Express 5 passes rejections on; this keeps the handlers free of try/catch. */
const handled =
  (handler: Handler): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

const memberOf = (res: Response) => res.locals.member!;

// ------------------------------------------------------------- answers --

const num = (v: string | null) => (v === null ? null : Number(v));

type SiteRow = NonNullable<Awaited<ReturnType<typeof getSite>>>;
function siteAnswer(site: SiteRow): ApiSite {
  return {
    id: site.id,
    name: site.name,
    time_zone: site.timeZone,
    floor_area_m2: num(site.floorAreaM2),
    degree_day_base_c: Number(site.degreeDayBaseC),
    address: site.address,
    created_at: site.createdAt.toISOString(),
    archived_at: site.archivedAt?.toISOString() ?? null,
  };
}

type MeterRow = NonNullable<Awaited<ReturnType<typeof getMeter>>>;
function meterAnswer(meter: Omit<MeterRow, "siteName" | "timeZone">): ApiMeter {
  return {
    id: meter.id,
    site_id: meter.siteId,
    code: meter.code,
    name: meter.name,
    quantity: meter.quantity,
    carrier: meter.carrier,
    orientation: meter.orientation,
    interval_minutes: meter.intervalMinutes as ApiMeter["interval_minutes"],
    parent_meter_id: meter.parentMeterId,
    position: meter.position,
    serial: meter.serial,
    multiplier: Number(meter.multiplier),
    rollover_kwh: num(meter.rolloverKwh),
    sensor_at: meter.sensorAt,
    default_pressure_bar_abs: num(meter.defaultPressureBarAbs),
    spike_factor: Number(meter.spikeFactor),
    accuracy_class: meter.accuracyClass,
    delta_theta_min_k: num(meter.deltaThetaMinK),
    qp_m3_per_h: num(meter.qpM3PerH),
    installed_at: meter.installedAt.toISOString(),
    removed_at: meter.removedAt?.toISOString() ?? null,
    replaced_by_meter_id: meter.replacedByMeterId,
  };
}

// ---------------------------------------------- bodies → the pages' forms --

/** The form field a number or null stands for ("" is the empty field). */
const field = (v: number | string | null | undefined) =>
  v === null || v === undefined ? "" : String(v);

/** A form schema's field names (camelCase) as the API's (snake_case). */
const snakeCase = (path: string) =>
  path.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

/**
 * Checks the form fields with a page's schema; answers 400 with the issues
 * named as the API names its fields, and returns null, when they are bad.
 */
function checkedByForm<S extends z.ZodType>(
  res: Response,
  schema: S,
  fields: Record<string, string>,
): z.output<S> | null {
  const parsed = schema.safeParse(fields);
  if (parsed.success) return parsed.data;
  sendError(
    res,
    400,
    "invalid_body",
    "The request body is not valid.",
    zodIssues(parsed.error).map((i) => ({ ...i, path: snakeCase(i.path) })),
  );
  return null;
}

type SiteBody = z.output<typeof siteCreateBodySchema>;
function siteInput(res: Response, body: SiteBody): SiteInput | null {
  const form = checkedByForm(res, siteFormSchema, {
    intent: "save-site",
    name: body.name,
    timeZone: body.time_zone,
    floorAreaM2: field(body.floor_area_m2),
    degreeDayBaseC: field(body.degree_day_base_c),
    address: body.address ?? "",
  });
  if (!form) return null;
  const { intent: _intent, ...input } = form;
  return input;
}

/** A stored site as a full create body, for PATCH to lay its changes over. */
function siteBodyOf(site: SiteRow): SiteBody {
  return {
    name: site.name,
    time_zone: site.timeZone,
    floor_area_m2: num(site.floorAreaM2),
    degree_day_base_c: Number(site.degreeDayBaseC),
    address: site.address,
  };
}

type MeterSettings = z.output<typeof meterUpdateBodySchema>;
function meterInput(
  res: Response,
  body: Omit<MeterSettings, "accuracy_class"> &
    Pick<ApiMeter, "code" | "name" | "quantity"> & {
      accuracy_class?: number | null;
    },
): MeterInput | null {
  const form = checkedByForm(res, meterFormSchema, {
    intent: "save-meter",
    code: body.code,
    name: body.name,
    quantity: body.quantity,
    carrier: field(body.carrier),
    orientation: field(body.orientation),
    intervalMinutes: field(body.interval_minutes),
    parentMeterId: field(body.parent_meter_id),
    position: body.position ?? "boundary",
    serial: body.serial ?? "",
    multiplier: field(body.multiplier),
    rolloverKwh: field(body.rollover_kwh),
    sensorAt: field(body.sensor_at),
    defaultPressureBarAbs: field(body.default_pressure_bar_abs),
    spikeFactor: field(body.spike_factor),
    accuracyClass: field(body.accuracy_class),
    deltaThetaMinK: field(body.delta_theta_min_k),
    qpM3PerH: field(body.qp_m3_per_h),
    installedAt: field(body.installed_at),
  });
  if (!form) return null;
  const { intent: _intent, ...input } = form;
  return input;
}

/** A taken name or code, or a parent on another site: the same words as the pages. */
function sendRuleError(res: Response, error: unknown): void {
  if (error instanceof DuplicateNameError)
    return sendError(res, 409, "duplicate", error.message);
  if (error instanceof ResolutionFixedError)
    return sendError(res, 409, "resolution_fixed", error.message, [
      { path: "interval_minutes", message: error.message },
    ]);
  if (error instanceof MeterRuleError)
    return sendError(res, 400, "invalid_body", error.message, [
      { path: "parent_meter_id", message: error.message },
    ]);
  throw error;
}

// ---------------------------------------------------------------- sites --

const noSuchSite = (res: Response) =>
  sendError(res, 404, "not_found", "No such site.");

async function findSite(req: Request, res: Response) {
  const siteId = String(req.params.siteId);
  if (!isUuid(siteId)) return null;
  return getSite({ organizationId: memberOf(res).organizationId, siteId });
}

/** GET /orgs/:orgId/sites: the sites in use (not archived), by name. */
export const getSites = handled(async (_req, res) => {
  const sites = await listSites(memberOf(res));
  res.json({ sites: sites.map(siteAnswer) });
});

export const getOneSite = handled(async (req, res) => {
  const site = await findSite(req, res);
  if (!site) return noSuchSite(res);
  res.json(siteAnswer(site));
});

export const postSite = handled(async (req, res) => {
  const body = siteCreateBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const input = siteInput(res, body.data);
  if (!input) return;
  const { organizationId } = memberOf(res);
  try {
    const siteId = await createSite({
      organizationId,
      ...auditActorOf(memberOf(res)),
      input,
    });
    const site = await getSite({ organizationId, siteId });
    res.status(201).json(siteAnswer(site!));
  } catch (error) {
    sendRuleError(res, error);
  }
});

/** PATCH: the fields sent replace the stored ones; the whole is checked as the page checks it. */
export const patchSite = handled(async (req, res) => {
  const body = siteUpdateBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const site = await findSite(req, res);
  if (!site) return noSuchSite(res);
  const input = siteInput(res, { ...siteBodyOf(site), ...body.data });
  if (!input) return;
  const { organizationId } = memberOf(res);
  try {
    await updateSite({
      organizationId,
      ...auditActorOf(memberOf(res)),
      siteId: site.id,
      input,
    });
    res.json(siteAnswer((await getSite({ organizationId, siteId: site.id }))!));
  } catch (error) {
    sendRuleError(res, error);
  }
});

export const postSiteArchive = handled(async (req, res) => {
  const site = await findSite(req, res);
  if (!site) return noSuchSite(res);
  const { organizationId } = memberOf(res);
  await archiveSite({
    organizationId,
    ...auditActorOf(memberOf(res)),
    siteId: site.id,
  });
  res.json(siteAnswer((await getSite({ organizationId, siteId: site.id }))!));
});

// --------------------------------------------------------------- meters --

const noSuchMeter = (res: Response) =>
  sendError(res, 404, "not_found", "No such meter.");

async function findMeter(req: Request, res: Response) {
  const meterId = String(req.params.meterId);
  if (!isUuid(meterId)) return null;
  return getMeter({ organizationId: memberOf(res).organizationId, meterId });
}

/** GET /orgs/:orgId/meters[?site_id]: retired meters included (removed_at set). */
export const getMeters = handled(async (req, res) => {
  const query = meterListQuerySchema.safeParse(req.query);
  if (!query.success) return sendValidationError(res, query.error);
  const { organizationId } = memberOf(res);
  const meters = query.data.site_id
    ? await listSiteMeters({ organizationId, siteId: query.data.site_id })
    : await listAllMeters({ organizationId });
  res.json({ meters: meters.map(meterAnswer) });
});

export const getOneMeter = handled(async (req, res) => {
  const meter = await findMeter(req, res);
  if (!meter) return noSuchMeter(res);
  res.json(meterAnswer(meter));
});

export const postMeter = handled(async (req, res) => {
  const body = meterCreateBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const { organizationId } = memberOf(res);
  const site = await getSite({ organizationId, siteId: body.data.site_id });
  if (!site || site.archivedAt)
    return sendError(res, 400, "invalid_body", "No such site in use here.", [
      { path: "site_id", message: "No such site in use here." },
    ]);
  const input = meterInput(res, body.data);
  if (!input) return;
  try {
    const meterId = await createMeter({
      organizationId,
      ...auditActorOf(memberOf(res)),
      siteId: site.id,
      input,
    });
    res
      .status(201)
      .json(meterAnswer((await getMeter({ organizationId, meterId }))!));
  } catch (error) {
    sendRuleError(res, error);
  }
});

/** PATCH: the fields sent replace the stored ones; a meter stays on its site. */
export const patchMeter = handled(async (req, res) => {
  const body = meterUpdateBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const meter = await findMeter(req, res);
  if (!meter) return noSuchMeter(res);
  const { site_id: _site, ...stored } = meterAnswer(meter);
  const input = meterInput(res, { ...stored, ...body.data });
  if (!input) return;
  const { organizationId } = memberOf(res);
  try {
    await updateMeter({
      organizationId,
      ...auditActorOf(memberOf(res)),
      meterId: meter.id,
      siteId: meter.siteId,
      input,
    });
    res.json(
      meterAnswer((await getMeter({ organizationId, meterId: meter.id }))!),
    );
  } catch (error) {
    sendRuleError(res, error);
  }
});

/** Retires the meter as the page does: readings after removed_at are refused. */
export const postMeterArchive = handled(async (req, res) => {
  const body = meterArchiveBodySchema.safeParse(req.body ?? {});
  if (!body.success) return sendValidationError(res, body.error);
  const meter = await findMeter(req, res);
  if (!meter) return noSuchMeter(res);
  if (meter.removedAt)
    return sendError(
      res,
      409,
      "already_retired",
      `This meter was retired on ${meter.removedAt.toISOString()}.`,
    );
  const form = checkedByForm(res, retireSchema, {
    intent: "retire",
    reason: body.data.reason ?? "",
    removedAt: body.data.removed_at ?? new Date().toISOString(),
  });
  if (!form) return;
  const { organizationId } = memberOf(res);
  await retireMeter({
    organizationId,
    ...auditActorOf(memberOf(res)),
    meterId: meter.id,
    removedAt: form.removedAt!,
    reason: form.reason,
  });
  res.json(
    meterAnswer((await getMeter({ organizationId, meterId: meter.id }))!),
  );
});
