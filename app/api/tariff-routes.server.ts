/**
 * The route table's entries for tariffs (tariffs.server.ts), spread into
 * routes.server.ts: reads for every member, writes for owners and energy
 * managers (`tariffs.manage`).
 */
import {
  tariffInputSchema,
  tariffListSchema,
  tariffSchema,
  tariffVersionInputSchema,
} from "~/tariffs/tariff-schema";
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import { orgPathSchema } from "./schemas";
import {
  getTariffs,
  postTariff,
  postTariffVersion,
  tariffPathSchema,
} from "./tariffs.server";

const dayBands = [
  { name: "Day", rate_per_kwh: "0.2650", windows: "Mon-Sun 07:00-23:00" },
  { name: "Night", rate_per_kwh: "0.1720", windows: "Mon-Sun 23:00-07:00" },
];
const versionExample = {
  valid_from: "2026-04-01",
  valid_to: null,
  rates: {
    bands: dayBands,
    standing_charge_per_day: "1.25",
    capacity_charge_per_day: "0.80",
    max_demand_rate_per_kw_month: "2.10",
    levies: [{ name: "Climate levy", rate_per_kwh: "0.00775" }],
    export_rate_per_kwh: "0.055",
    vat_percent: "20",
  },
};
const refused = errorReply("The role may not change tariffs");
const bad = errorReply(
  "Not valid, with the reason: a negative rate, bands that leave a quarter hour of the week unpriced or price it twice, overlapping versions, an unknown site or meter",
);

export function tariffRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/tariffs",
      summary: "The organisation's tariffs with their versions",
      access: member("tariffs.view"),
      params: orgPathSchema,
      handler: getTariffs,
      responses: { 200: jsonReply("`{ tariffs: [...] }`", tariffListSchema) },
    },
    {
      method: "post",
      path: "/orgs/:orgId/tariffs",
      summary: "Add a supply's tariff with its first version",
      description:
        "A supply is one boundary meter (`meter_id`) or a site's carrier (`meter_id` null). Rates are decimal text. The months the version covers are priced at once; a closed month's change is an adjusting entry. Recorded in the audit trail.",
      access: member("tariffs.manage"),
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "20kb",
        schema: tariffInputSchema,
        example: {
          name: "Civic Hall electricity",
          site_id: "8f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b",
          carrier: "electricity",
          meter_id: null,
          currency: "GBP",
          illustrative: false,
          first_version: versionExample,
        },
      },
      handler: postTariff,
      responses: {
        201: jsonReply("The tariff as stored", tariffSchema),
        400: bad,
        403: refused,
        409: errorReply("The supply already has a tariff"),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/tariffs/:tariffId/versions",
      summary: "Add a version of a tariff (a change of rates from a day)",
      description:
        "A version without an end that started earlier is ended the day before the new one; any other overlap is refused. Months from the new version's first are priced again; closed months get adjusting entries.",
      access: member("tariffs.manage"),
      params: tariffPathSchema,
      body: {
        kind: "json",
        limit: "20kb",
        schema: tariffVersionInputSchema,
        example: versionExample,
      },
      handler: postTariffVersion,
      responses: {
        201: jsonReply("The tariff with its versions", tariffSchema),
        400: bad,
        403: refused,
        404: errorReply("No such tariff here"),
      },
    },
  ];
}
