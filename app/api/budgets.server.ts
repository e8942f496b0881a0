/**
 * Budgets and the carbon target over the JSON API: every member reads,
 * owners and energy managers write (`carbon.manage`). Bodies are checked
 * with the page's schemas (app/budgets/budget-schema.ts); bad input answers
 * 400 with the reason and stores nothing.
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import { z } from "zod";
import {
  budgetInputSchema,
  carbonTargetInputSchema,
} from "~/budgets/budget-schema";
import { yearProgress } from "~/budgets/budget-progress.server";
import {
  getCarbonTarget,
  listBudgets,
  saveBudget,
  saveCarbonTarget,
} from "~/budgets/budgets.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";

const handled =
  (handler: (req: Request, res: Response) => Promise<void>): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

function actorOf(res: Response) {
  const member = res.locals.member!;
  return { organizationId: member.organizationId, ...auditActorOf(member) };
}

export const budgetQuerySchema = z.strictObject({
  financial_year: z.coerce
    .number()
    .int()
    .min(2000)
    .max(2100)
    .optional()
    .describe(
      "The calendar year the financial year starts in; all when left out",
    ),
});

export const getBudgets = handled(async (req, res) => {
  const query = budgetQuerySchema.safeParse(req.query);
  if (!query.success) return sendValidationError(res, query.error);
  res.json({
    budgets: await listBudgets(
      res.locals.member!.organizationId,
      query.data.financial_year,
    ),
  });
});

export const postBudget = handled(async (req, res) => {
  const body = budgetInputSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  const outcome = await saveBudget(actorOf(res), body.data);
  if (outcome.ok) {
    res.status(201).json(outcome.budget);
    return;
  }
  sendError(res, outcome.status, "invalid_body", outcome.reason, [
    { path: outcome.field, message: outcome.reason },
  ]);
});

export const getBudgetProgress = handled(async (req, res) => {
  const query = budgetQuerySchema.safeParse(req.query);
  if (!query.success) return sendValidationError(res, query.error);
  res.json(
    await yearProgress({
      organizationId: res.locals.member!.organizationId,
      year: query.data.financial_year,
    }),
  );
});

export const getTarget = handled(async (_req, res) => {
  res.json({
    target: await getCarbonTarget(res.locals.member!.organizationId),
  });
});

export const postTarget = handled(async (req, res) => {
  const body = carbonTargetInputSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  res.status(201).json(await saveCarbonTarget(actorOf(res), body.data));
});
