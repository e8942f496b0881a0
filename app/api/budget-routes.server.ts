/**
 * The route table's entries for budgets and the carbon target
 * (budgets.server.ts), spread into routes.server.ts: reads for every
 * member, writes for owners and energy managers (`carbon.manage`).
 */
import { z } from "zod";
import {
  budgetInputSchema,
  budgetListSchema,
  budgetSchema,
  carbonTargetInputSchema,
  carbonTargetReplySchema,
  carbonTargetSchema,
} from "~/budgets/budget-schema";
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import {
  budgetQuerySchema,
  getBudgetProgress,
  getBudgets,
  getTarget,
  postBudget,
  postTarget,
} from "./budgets.server";
import { orgPathSchema } from "./schemas";

const read = member("ledger.view");
const write = member("carbon.manage");
const refused = errorReply("The role may not change budgets or targets");
const bad = errorReply(
  "Not valid, with the reason: a negative or over-precise amount, a money budget without its currency, an unknown site, a target year not after the base year",
);

const progressSchema = z
  .looseObject({
    year: z.number().int(),
    label: z.string(),
    months: z.array(z.string()),
    lastMonthToDate: z.string(),
    budgets: z.array(z.looseObject({})),
    carbon: z.looseObject({}).nullable(),
  })
  .describe(
    "Each budget's months with budget, actual (ledger delivered kWh; tariffs' cost) and forecast; the carbon target's monthly path",
  );

export function budgetRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/budgets",
      summary:
        "Budgets per site, carrier and financial year, with their monthly spread",
      access: read,
      params: orgPathSchema,
      query: budgetQuerySchema,
      handler: getBudgets,
      responses: { 200: jsonReply("`{ budgets: [...] }`", budgetListSchema) },
    },
    {
      method: "post",
      path: "/orgs/:orgId/budgets",
      summary: "Set the budget of a site, carrier and financial year",
      description:
        "kWh (six decimals) and, optionally, money (two decimals) with its currency, spread over the year's months flat or by the site's heating degree days of the year before. Replaces the budget of the same site, carrier and year. Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "10kb",
        schema: budgetInputSchema,
        example: {
          site_id: "8f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b",
          carrier: "electricity",
          financial_year: 2026,
          energy_kwh: "240000",
          amount: "62000.00",
          currency: "GBP",
          spread: "flat",
        },
      },
      handler: postBudget,
      responses: {
        201: jsonReply("The budget as stored, with its spread", budgetSchema),
        400: bad,
        403: refused,
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/budgets/progress",
      summary:
        "Actual against budget by month, forecast to year end, carbon target progress",
      description:
        "Months up to the last complete month are actual; each later month is its budget × (Σ actual ÷ Σ budget to date). kWh are never added across carriers.",
      access: read,
      params: orgPathSchema,
      query: budgetQuerySchema,
      handler: getBudgetProgress,
      responses: { 200: jsonReply("The year's progress", progressSchema) },
    },
    {
      method: "get",
      path: "/orgs/:orgId/carbon-target",
      summary: "The organisation's carbon target, or null",
      access: read,
      params: orgPathSchema,
      handler: getTarget,
      responses: { 200: jsonReply("`{ target }`", carbonTargetReplySchema) },
    },
    {
      method: "post",
      path: "/orgs/:orgId/carbon-target",
      summary:
        "Set the carbon target: a percentage below a base financial year",
      description:
        "Location- or market-based CO₂e of all carriers. Replaces the organisation's target. Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "2kb",
        schema: carbonTargetInputSchema,
        example: {
          base_year: 2024,
          target_year: 2026,
          reduction_percent: "10",
          basis: "location",
        },
      },
      handler: postTarget,
      responses: {
        201: jsonReply("The target as stored", carbonTargetSchema),
        400: bad,
        403: refused,
      },
    },
  ];
}
