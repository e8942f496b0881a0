/**
 * The route table's entries for supplier bills (app/supplier-bills), spread
 * into routes.server.ts: reads for every member, writes for owners, energy
 * managers and finance (`bills.manage`).
 */
import {
  billListSchema,
  billSchema,
  billStateChangeSchema,
  billUploadAnswerSchema,
  billUploadSchema,
} from "~/supplier-bills/bill-schema";
import {
  errorReply,
  fileReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import { orgPathSchema } from "./schemas";
import {
  billListQuerySchema,
  billPathSchema,
  getBills,
  getQueriedBillsCsv,
  postBills,
  postBillState,
} from "./supplier-bills.server";

const refused = errorReply("The role may not change supplier bills");

export function supplierBillRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/bills",
      summary: "The supplier bills with what the meters and the tariff say",
      description:
        "Each bill carries the metered kWh and the computed cost of its supply and months as found on upload, its state (agreed, queried, resolved) and the latest note. `state` filters.",
      access: member("bills.view"),
      params: orgPathSchema,
      query: billListQuerySchema,
      handler: getBills,
      responses: { 200: jsonReply("`{ bills: [...] }`", billListSchema) },
    },
    {
      method: "get",
      path: "/orgs/:orgId/bills/queried.csv",
      summary: "The queried bills as CSV, for the supplier",
      access: member("bills.view"),
      params: orgPathSchema,
      handler: getQueriedBillsCsv,
      responses: { 200: fileReply("The CSV", "text/csv") },
    },
    {
      method: "post",
      path: "/orgs/:orgId/bills",
      summary: "Upload supplier bills as JSON rows, all or none",
      description:
        "A supply is a meter code (of a meter a tariff prices) or a tariff's name. Periods are whole site-local months (`period_from` a first day, `period_to` a last day). Each bill is set against the metered kWh and the computed cost; a difference beyond the organisation's tolerance makes it `queried`, else `agreed`. An unknown supply, a part month or a different bill already stored for the same supply and period refuses the whole call with each row's reason (`issues[].path` is `bills.<index>`); a bill already stored with the same figures is counted in `already_stored` and left as it is. Recorded in the audit trail.",
      access: member("bills.manage"),
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "500kb",
        schema: billUploadSchema,
        example: {
          bills: [
            {
              supply: "CH-EL-01",
              period_from: "2025-01-01",
              period_to: "2025-01-31",
              kwh: "18250.5",
              amount: "5120.40",
              read_type: "actual",
            },
          ],
        },
      },
      handler: postBills,
      responses: {
        200: jsonReply("What was stored", billUploadAnswerSchema),
        400: errorReply(
          "Refused, nothing stored: an unknown supply, a part month, a bad figure, a different bill for the same period",
        ),
        403: refused,
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/bills/:billId/state",
      summary: "Set a bill's state (agreed, queried, resolved) with a note",
      description:
        "Kept in the bill's history with who and when, and in the audit trail.",
      access: member("bills.manage"),
      params: billPathSchema,
      body: {
        kind: "json",
        limit: "10kb",
        schema: billStateChangeSchema,
        example: { state: "resolved", note: "Credit note received" },
      },
      handler: postBillState,
      responses: {
        200: jsonReply("The bill", billSchema),
        403: refused,
        404: errorReply("No such bill here"),
      },
    },
  ];
}
