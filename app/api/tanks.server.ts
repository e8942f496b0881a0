/**
 * A tank meter's settings, dips and deliveries over the JSON API
 * (app/tanks/, docs/fuels-tanks.md). A meter of another organisation, or
 * none, answers 404 like every tenant id; a liquid-fuel meter without tank
 * settings answers 404 `not_a_tank` to the dip and delivery routes.
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import { isUuid } from "~/lib/ids";
import { getMeter } from "~/sites/meters.server";
import type { DipPeriod } from "~/tanks/tank-balance";
import {
  tankDeliveryBodySchema,
  tankDipBodySchema,
  tankSettingsBodySchema,
  type ApiTank,
  type TankEntryAnswer,
  type TankPeriodWire,
} from "~/tanks/tank-schema";
import {
  addTankDelivery,
  addTankDip,
  getTank,
  listTankEntries,
  notATank,
  saveTank,
  TankRuleError,
  tankPeriods,
  type EntryOutcome,
  type Tank,
} from "~/tanks/tanks.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";

type Handler = (req: Request, res: Response) => Promise<void>;

/** Express 5 passes rejections on; a tank's refusal becomes its answer. */
const handled =
  (handler: Handler): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch((error: unknown) => {
      if (!(error instanceof TankRuleError)) return next(error);
      sendError(
        res,
        error.status,
        error.code,
        error.message,
        error.fields.length
          ? error.fields.map((path) => ({ path, message: error.message }))
          : undefined,
      );
    });

const memberOf = (res: Response) => res.locals.member!;

async function findMeter(req: Request, res: Response) {
  const meterId = String(req.params.meterId);
  const meter = isUuid(meterId)
    ? await getMeter({ organizationId: memberOf(res).organizationId, meterId })
    : null;
  if (!meter) throw new TankRuleError(404, "not_found", "No such meter.");
  return meter;
}

async function findTank(req: Request, res: Response) {
  const meter = await findMeter(req, res);
  const tank = await getTank(memberOf(res).organizationId, meter.id);
  if (!tank) throw notATank();
  return { meter, tank };
}

function tankAnswer(tank: Tank): ApiTank {
  return {
    meter_id: tank.meterId,
    capacity_l: tank.capacityL,
    density_kg_l: tank.densityKgL,
    calorific_value_mj_kg: tank.calorificValueMjKg,
    cv_basis: tank.cvBasis,
  };
}

export function periodAnswer(p: DipPeriod): TankPeriodWire {
  return {
    from: p.from.toISOString(),
    to: p.to.toISOString(),
    opening_stock_l: p.openingStockL,
    deliveries_l: p.deliveriesL,
    closing_stock_l: p.closingStockL,
    consumption_l: p.consumptionL,
    density_kg_l: p.densityKgL,
    calorific_value_mj_kg: p.calorificValueMjKg,
    energy_kwh: p.energyKwh,
  };
}

const entryAnswer = (outcome: EntryOutcome): TankEntryAnswer => ({
  periods: outcome.periods.map(periodAnswer),
  adjustments: outcome.adjustments,
});

export const getTankSettings = handled(async (req, res) => {
  const { tank } = await findTank(req, res);
  res.json(tankAnswer(tank));
});

export const postTankSettings = handled(async (req, res) => {
  const body = tankSettingsBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const meter = await findMeter(req, res);
  const { organizationId } = memberOf(res);
  await saveTank({
    organizationId,
    meter,
    body: body.data,
    actor: auditActorOf(memberOf(res)),
  });
  res.json(tankAnswer((await getTank(organizationId, meter.id))!));
});

export const getTankDips = handled(async (req, res) => {
  const { meter, tank } = await findTank(req, res);
  const entries = await listTankEntries(memberOf(res).organizationId, meter.id);
  res.json({
    tank: tankAnswer(tank),
    dips: entries.dips.map((d) => ({
      time: d.time.toISOString(),
      stock_l: d.stockL,
      note: d.note,
    })),
    periods: tankPeriods(tank, entries).map(periodAnswer),
  });
});

export const postTankDip = handled(async (req, res) => {
  const body = tankDipBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const { meter } = await findTank(req, res);
  const outcome = await addTankDip({
    organizationId: memberOf(res).organizationId,
    meter,
    body: body.data,
    actor: auditActorOf(memberOf(res)),
  });
  res.status(201).json(entryAnswer(outcome));
});

export const getTankDeliveries = handled(async (req, res) => {
  const { meter, tank } = await findTank(req, res);
  const entries = await listTankEntries(memberOf(res).organizationId, meter.id);
  res.json({
    tank: tankAnswer(tank),
    deliveries: entries.deliveries.map((d) => ({
      id: d.id,
      time: d.time.toISOString(),
      volume_l: d.volumeL,
      density_kg_l: d.densityKgL ?? null,
      calorific_value_mj_kg: d.calorificValueMjKg ?? null,
      note: d.note,
    })),
  });
});

export const postTankDelivery = handled(async (req, res) => {
  const body = tankDeliveryBodySchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const { meter } = await findTank(req, res);
  const outcome = await addTankDelivery({
    organizationId: memberOf(res).organizationId,
    meter,
    body: body.data,
    actor: auditActorOf(memberOf(res)),
  });
  res.status(201).json({ id: outcome.id, ...entryAnswer(outcome) });
});
