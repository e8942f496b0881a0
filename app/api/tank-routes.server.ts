/**
 * The route table's entries for oil and LPG tanks (tanks.server.ts): a
 * liquid-fuel meter's tank settings, dips and deliveries. Reads for every
 * member (auditors included), dips and deliveries for the roles that edit
 * readings, settings for the roles that manage meters. Spread into
 * routes.server.ts.
 */
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import { meterPathSchema } from "./schemas";
import {
  getTankDeliveries,
  getTankDips,
  getTankSettings,
  postTankDelivery,
  postTankDip,
  postTankSettings,
} from "./tanks.server";
import {
  tankDeliveryAnswerSchema,
  tankDeliveryBodySchema,
  tankDeliveryListSchema,
  tankDipBodySchema,
  tankDipListSchema,
  tankEntryAnswerSchema,
  tankSchema,
  tankSettingsBodySchema,
} from "~/tanks/tank-schema";

const BODY_LIMIT = "4kb";
const read = member("readings.view");
const notTank = errorReply(
  "No such meter here, or (`not_a_tank`) the meter has no tank settings",
);
const entryRefused = errorReply(
  "Not valid: the issues name the fields and the range. `negative_consumption` names opening_stock_l, deliveries_l and closing_stock_l; nothing is stored",
);

export function tankRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId/tank",
      summary: "A tank meter's capacity and declared fuel",
      access: read,
      params: meterPathSchema,
      handler: getTankSettings,
      responses: { 200: jsonReply("The tank", tankSchema), 404: notTank },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters/:meterId/tank",
      summary: "Make a liquid-fuel meter a tank, or change its settings",
      description:
        "Capacity (a dip above it is refused), and the density and CV used where a delivery note gives none. The capacity cannot go below a stored dip. A change of the declared fuel reprices the stored periods. Recorded in the audit trail.",
      access: member("sites.manage"),
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: tankSettingsBodySchema,
        example: {
          capacity_l: 5000,
          density_kg_l: 0.845,
          calorific_value_mj_kg: 45.5,
          cv_basis: "gross",
        },
      },
      handler: postTankSettings,
      responses: {
        200: jsonReply("The tank as stored", tankSchema),
        400: errorReply("Not valid: the issues name the fields and ranges"),
        404: errorReply("No such meter here"),
        409: errorReply(
          "`not_liquid_fuel`: the meter does not measure liquid_fuel",
        ),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId/tank-dips",
      summary: "A tank's dips, and the consumption between consecutive ones",
      access: read,
      params: meterPathSchema,
      handler: getTankDips,
      responses: {
        200: jsonReply("The dips and periods, oldest first", tankDipListSchema),
        404: notTank,
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters/:meterId/tank-dips",
      summary: "Enter a dip (the tank's stock at an instant)",
      description:
        "The consumption of the periods on either side is opening + deliveries − closing; its energy, L × ρ × CV / 3.6, is spread flat over the meter's intervals between the two dips, marked estimated (`tank_spread`). A dip in a closed month gives adjusting entries. Recorded in the audit trail.",
      access: member("readings.edit"),
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: tankDipBodySchema,
        example: {
          time: "2026-03-02T08:00:00Z",
          stock_l: 3120,
          note: "weekly dip",
        },
      },
      handler: postTankDip,
      responses: {
        201: jsonReply(
          "The periods the dip changed, and the adjusting entries written",
          tankEntryAnswerSchema,
        ),
        400: entryRefused,
        404: notTank,
        409: errorReply(
          "`dip_exists`: the tank already has a dip at that time",
        ),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId/tank-deliveries",
      summary: "A tank's deliveries, oldest first",
      access: read,
      params: meterPathSchema,
      handler: getTankDeliveries,
      responses: {
        200: jsonReply("The deliveries", tankDeliveryListSchema),
        404: notTank,
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters/:meterId/tank-deliveries",
      summary:
        "Enter a delivery, with the note's density and CV if it gives them",
      description:
        "The delivery counts in the period whose closing dip is at or after it. A period's fuel is the latest note at or before its closing dip, else the tank's declared fuel. Recorded in the audit trail.",
      access: member("readings.edit"),
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: tankDeliveryBodySchema,
        example: {
          time: "2026-02-20T11:30:00Z",
          volume_l: 3000,
          density_kg_l: 0.842,
          calorific_value_mj_kg: 45.6,
          note: "Delivery note 4471",
        },
      },
      handler: postTankDelivery,
      responses: {
        201: jsonReply(
          "The delivery's id, the periods it changed and the adjusting entries written",
          tankDeliveryAnswerSchema,
        ),
        400: entryRefused,
        404: notTank,
      },
    },
  ];
}
