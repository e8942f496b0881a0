/**
 * The route table's entries for a gas supply (gas-supply.server.ts): reads
 * for every member who may see readings, writes for the roles that manage
 * meters, as the meter routes. Spread into routes.server.ts.
 */
import { meterPathSchema } from "./schemas";
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import {
  cvListSchema,
  cvPathSchema,
  cvPostBodySchema,
  cvSaveAnswerSchema,
  gasSettingsInputSchema,
  gasSettingsSchema,
} from "~/gas/gas-wire";
import {
  deleteCalorificValueRoute,
  getCalorificValues,
  getGasSettingsRoute,
  postCalorificValues,
  postGasSettings,
} from "./gas-supply.server";

const read = member("readings.view");
const write = member("sites.manage");
const refused = errorReply("The role may not manage meters");
const notGas = errorReply(
  "No such meter here (404), or (400, not_a_gas_supply) it is not a natural-gas meter",
);
const PATH = "/orgs/:orgId/meters/:meterId/calorific-values";

export function gasSupplyRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: PATH,
      summary: "A gas supply's calorific values, oldest period first",
      access: read,
      params: meterPathSchema,
      handler: getCalorificValues,
      responses: {
        200: jsonReply("The series", cvListSchema),
        404: notGas,
      },
    },
    {
      method: "post",
      path: PATH,
      summary:
        "Enter calorific values (one, or `{ entries }`): new periods or corrected values",
      description:
        "A month (2026-03) or a day (2026-03-15; a day's value beats its month's), 10–60 MJ/m³, gross (default) or net, an optional source. All are stored or none. The intervals of each period whose energy took its CV from the series are recomputed; in a closed month the difference becomes an adjusting entry. Recorded in the audit trail.",
      access: write,
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: "200kb",
        schema: cvPostBodySchema,
        example: {
          period: "2026-03",
          calorific_value_mj_m3: 39.4,
          basis: "gross",
          source: "Supplier bill, March 2026",
        },
      },
      handler: postCalorificValues,
      responses: {
        201: jsonReply(
          "The series as stored, and what changed",
          cvSaveAnswerSchema,
        ),
        400: errorReply(
          "Not valid (the issues name the field and its range), or not a natural-gas meter",
        ),
        403: refused,
        404: notGas,
      },
    },
    {
      method: "delete",
      path: `${PATH}/:period`,
      summary: "Remove a calorific value no reading has used yet",
      access: write,
      params: cvPathSchema,
      handler: deleteCalorificValueRoute,
      responses: {
        204: { description: "Removed" },
        403: refused,
        404: errorReply("No such meter here, or no value for that period"),
        409: errorReply(
          "Readings were priced with it: enter a corrected value instead",
        ),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId/gas-settings",
      summary: "A gas meter's register unit and volume correction",
      access: read,
      params: meterPathSchema,
      handler: getGasSettingsRoute,
      responses: {
        200: jsonReply("The settings", gasSettingsSchema),
        404: notGas,
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters/:meterId/gas-settings",
      summary:
        "Set a gas meter's register unit (m3 or hcf) and volume correction, before its first reading",
      description:
        "Every field; one left out is none. A correction factor, or the gas temperature (−20 to 60 °C) with the gauge pressure (0 to 5000 mbar g); neither: volumes already at 15 °C and 1013.25 mbar. The register's multiplier and roll-over point are the meter's own (in the register's unit). Fixed once the meter has readings (409).",
      access: write,
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: "10kb",
        schema: gasSettingsInputSchema,
        example: {
          register_unit: "hcf",
          gas_temp_c: 12,
          gas_pressure_mbar_g: 21,
        },
      },
      handler: postGasSettings,
      responses: {
        200: jsonReply("The settings as stored", gasSettingsSchema),
        403: refused,
        404: notGas,
        409: errorReply("The meter has readings: its settings are fixed"),
      },
    },
  ];
}
