/**
 * A gas supply over the JSON API: its calorific values (list, enter, remove
 * one not yet used) and its meter's register and correction settings. The
 * meter must be one of the organisation's natural-gas meters (another
 * organisation's answers 404, as every meter route does).
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import {
  CvInUseError,
  deleteCalorificValue,
  findGasSupply,
  listCalorificValues,
  NotAGasSupplyError,
  saveCalorificValues,
  type GasSupplyMeter,
  type StoredCv,
} from "~/gas/calorific-values.server";
import { parseCvPeriod } from "~/gas/calorific-values";
import { settingsCorrection, type GasSettings } from "~/gas/gas-intervals";
import {
  GasSettingsFixedError,
  getGasSettings,
  saveGasSettings,
} from "~/gas/gas-settings.server";
import {
  calorificValueInputSchema,
  cvBatchSchema,
  gasSettingsInputSchema,
  type gasSettingsSchema,
  type storedCvSchema,
} from "~/gas/gas-wire";
import { isUuid } from "~/lib/ids";
import type { z } from "zod";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";

type Handler = (req: Request, res: Response) => Promise<void>;

const handled =
  (handler: Handler): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

const memberOf = (res: Response) => res.locals.member!;

/** The supply, or an answer already sent (404 not here, 400 not a gas meter). */
async function supplyOf(
  req: Request,
  res: Response,
): Promise<GasSupplyMeter | null> {
  const meterId = String(req.params.meterId);
  const noSuchMeter = () => sendError(res, 404, "not_found", "No such meter.");
  if (!isUuid(meterId)) return (noSuchMeter(), null);
  try {
    const meter = await findGasSupply(memberOf(res).organizationId, meterId);
    if (!meter) noSuchMeter();
    return meter;
  } catch (error) {
    if (!(error instanceof NotAGasSupplyError)) throw error;
    sendError(res, 400, "not_a_gas_supply", error.message);
    return null;
  }
}

const cvAnswer = (cv: StoredCv): z.output<typeof storedCvSchema> => ({
  period: cv.period,
  period_kind: cv.periodKind,
  calorific_value_mj_m3: cv.calorificValueMjM3,
  basis: cv.basis,
  source: cv.source,
  updated_at: cv.updatedAt.toISOString(),
});

async function listAnswer(organizationId: string, meterId: string) {
  const list = await listCalorificValues(organizationId, meterId);
  return { meter_id: meterId, calorific_values: list.map(cvAnswer) };
}

export const getCalorificValues = handled(async (req, res) => {
  const meter = await supplyOf(req, res);
  if (!meter) return;
  res.json(await listAnswer(memberOf(res).organizationId, meter.id));
});

/** One entry, or `{ entries: [...] }`: all are stored or none. */
export const postCalorificValues = handled(async (req, res) => {
  const isBatch =
    typeof req.body === "object" && req.body !== null && "entries" in req.body;
  const parsed = isBatch
    ? cvBatchSchema.safeParse(req.body)
    : calorificValueInputSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  const entries =
    "entries" in parsed.data ? parsed.data.entries : [parsed.data];
  const periods = entries.map((e) => e.period.trim());
  const twice = periods.find((p, i) => periods.indexOf(p) !== i);
  if (twice)
    return sendError(
      res,
      400,
      "invalid_body",
      "The request body is not valid.",
      [{ path: "entries", message: `entries: period ${twice} appears twice` }],
    );
  const meter = await supplyOf(req, res);
  if (!meter) return;
  const { organizationId } = memberOf(res);
  const outcome = await saveCalorificValues({
    organizationId,
    meter,
    entries,
    actor: auditActorOf(memberOf(res)),
  });
  res.status(201).json({
    ...(await listAnswer(organizationId, meter.id)),
    saved: outcome.saved,
    intervals_repriced: outcome.intervalsRepriced,
  });
});

export const deleteCalorificValueRoute = handled(async (req, res) => {
  const period = parseCvPeriod(String(req.params.period));
  const meter = await supplyOf(req, res);
  if (!meter) return;
  const notFound = () =>
    sendError(res, 404, "not_found", "No calorific value for that period.");
  if (!period) return notFound();
  try {
    const removed = await deleteCalorificValue({
      organizationId: memberOf(res).organizationId,
      meter,
      period,
      actor: auditActorOf(memberOf(res)),
    });
    if (!removed) return notFound();
    res.status(204).end();
  } catch (error) {
    if (!(error instanceof CvInUseError)) throw error;
    sendError(res, 409, "in_use", error.message);
  }
});

const settingsAnswer = (
  s: GasSettings,
): z.output<typeof gasSettingsSchema> => ({
  register_unit: s.registerUnit,
  correction_factor: s.correctionFactor,
  gas_temp_c: s.gasTempC,
  gas_pressure_mbar_g: s.gasPressureMbarG,
  atmospheric_pressure_mbar: s.atmosphericPressureMbar,
  effective_correction_factor: settingsCorrection(s),
});

export const getGasSettingsRoute = handled(async (req, res) => {
  const meter = await supplyOf(req, res);
  if (!meter) return;
  res.json(
    settingsAnswer(
      await getGasSettings(memberOf(res).organizationId, meter.id),
    ),
  );
});

export const postGasSettings = handled(async (req, res) => {
  const body = gasSettingsInputSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const meter = await supplyOf(req, res);
  if (!meter) return;
  try {
    const saved = await saveGasSettings({
      organizationId: memberOf(res).organizationId,
      meter,
      input: body.data,
      actor: auditActorOf(memberOf(res)),
    });
    res.json(settingsAnswer(saved));
  } catch (error) {
    if (!(error instanceof GasSettingsFixedError)) throw error;
    sendError(res, 409, "settings_fixed", error.message);
  }
});
