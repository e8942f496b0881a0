/**
 * The supplier-bills API: every member reads the bills; owners, energy
 * managers and finance upload them as JSON rows and change their state. A
 * refused upload answers 400 with each row's reason and stores nothing.
 */
import type { NextFunction, Request, Response, RequestHandler } from "express";
import { z } from "zod";
import { idSchema } from "~/lib/ids";
import {
  billStateChangeSchema,
  billStates,
  billUploadSchema,
} from "~/supplier-bills/bill-schema";
import {
  changeBillState,
  listBills,
  queriedBillsCsv,
  uploadBills,
} from "~/supplier-bills/bills.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";
import { orgPathSchema } from "./schemas";

export const billPathSchema = orgPathSchema.extend({ billId: idSchema() });
export const billListQuerySchema = z.strictObject({
  state: z.enum(billStates).optional(),
});

const handled =
  (handler: (req: Request, res: Response) => Promise<void>): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

function actorOf(res: Response) {
  const member = res.locals.member!;
  return { organizationId: member.organizationId, ...auditActorOf(member) };
}

export const getBills = handled(async (req, res) => {
  const query = billListQuerySchema.safeParse(req.query);
  if (!query.success) return sendValidationError(res, query.error);
  res.json({
    bills: await listBills(res.locals.member!.organizationId, query.data.state),
  });
});

export const getQueriedBillsCsv = handled(async (_req, res) => {
  res
    .type("text/csv")
    .attachment("queried-bills.csv")
    .send(await queriedBillsCsv(res.locals.member!.organizationId));
});

export const postBills = handled(async (req, res) => {
  const body = billUploadSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  // Rows are numbered from 1, as the bills array lists them.
  const outcome = await uploadBills(
    actorOf(res),
    body.data.bills.map((bill, i) => ({ row: i + 1, bill })),
  );
  if (!outcome.ok)
    return sendError(
      res,
      400,
      "invalid_body",
      "Refused: nothing was stored.",
      outcome.problems.map((p) => ({
        path: `bills.${p.row - 1}`,
        message: p.reason,
      })),
    );
  res.status(200).json({
    stored: outcome.stored,
    already_stored: outcome.alreadyStored,
    agreed: outcome.agreed,
    queried: outcome.queried,
  });
});

export const postBillState = handled(async (req, res) => {
  const params = billPathSchema.safeParse(req.params);
  if (!params.success) return sendError(res, 404, "not_found", "No such bill.");
  const body = billStateChangeSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const bill = await changeBillState(
    actorOf(res),
    params.data.billId,
    body.data.state,
    body.data.note,
  );
  if (!bill) return sendError(res, 404, "not_found", "No such bill.");
  res.json(bill);
});
