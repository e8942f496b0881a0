/**
 * The route table's entries for emission factors and supply contracts
 * (carbon.server.ts): read by every member, written by owners and energy
 * managers. Spread into routes.server.ts.
 */
import { z } from "zod";
import {
  contractInputSchema,
  contractListSchema,
  contractSchema,
  factorSetListSchema,
  factorSetsBodySchema,
} from "~/carbon/factor-schema";
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import {
  getContracts,
  getFactorSets,
  postContract,
  postFactorSets,
} from "./carbon.server";
import { orgPathSchema } from "./schemas";

const read = member("ledger.view");
const write = member("carbon.manage");
const refused = errorReply("The role may not change emission factors");

const adjusted = z
  .number()
  .int()
  .describe("Closed meter-months that got an adjusting entry");

export function carbonRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/emission-factors",
      summary: "The organisation's emission-factor sets, by year and carrier",
      access: read,
      params: orgPathSchema,
      handler: getFactorSets,
      responses: { 200: jsonReply("`{ sets: [...] }`", factorSetListSchema) },
    },
    {
      method: "post",
      path: "/orgs/:orgId/emission-factors",
      summary: "Save factor sets (owners and energy managers)",
      description:
        "Each set replaces the organisation's set for its year and carrier; all are stored or none. A set without a source is refused. The scope follows from the carrier (fuels 1, bought energy 2). Closed months whose carbon changes get adjusting entries. Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "200kb",
        schema: factorSetsBodySchema,
        example: {
          sets: [
            {
              year: 2025,
              carrier: "electricity",
              location_kg_per_kwh: "0.207",
              market_kg_per_kwh: "0.35",
              scope3_kg_per_kwh: "0.045",
              source: "Example national grid factors",
              version: "2025 v1",
            },
          ],
        },
      },
      handler: postFactorSets,
      responses: {
        201: jsonReply(
          "The saved sets",
          factorSetListSchema.extend({ adjusted_months: adjusted }),
        ),
        400: errorReply("Not valid: the issues name the fields"),
        403: refused,
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/emission-contracts",
      summary: "Supply contracts giving a meter its own market-based factor",
      access: read,
      params: orgPathSchema,
      handler: getContracts,
      responses: {
        200: jsonReply("`{ contracts: [...] }`", contractListSchema),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/emission-contracts",
      summary: "Add a supplier-specific or zero-carbon contract to a supply",
      description:
        "For an import meter of the organisation, from a first month to an optional last one. Closed months it covers get adjusting entries. Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "10kb",
        schema: contractInputSchema,
        example: {
          meter_id: "8f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b",
          name: "Renewable supply contract",
          kg_per_kwh: "0",
          valid_from: "2025-04",
          valid_to: null,
        },
      },
      handler: postContract,
      responses: {
        201: jsonReply(
          "The new contract",
          contractSchema.extend({ adjusted_months: adjusted }),
        ),
        400: errorReply(
          "Not valid, or not an import meter of this organisation",
        ),
        403: refused,
      },
    },
  ];
}
