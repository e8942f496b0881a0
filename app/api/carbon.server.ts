/**
 * Emission-factor sets and supply contracts over the JSON API. Bodies are
 * checked with the same schemas as the page and the CSV upload
 * (app/carbon/factor-schema.ts); writes go through the same data access,
 * which records the audit entries and the adjusting entries of closed months.
 */
import type { NextFunction, Request, RequestHandler, Response } from "express";
import {
  contractInputSchema,
  factorSetsBodySchema,
} from "~/carbon/factor-schema";
import {
  ContractMeterError,
  createContract,
  listContracts,
  listFactorSets,
  saveFactorSets,
} from "~/carbon/emission-factors.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";

type Handler = (req: Request, res: Response) => Promise<void>;
const handled =
  (handler: Handler): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

const memberOf = (res: Response) => res.locals.member!;

export const getFactorSets = handled(async (_req, res) => {
  res.json({ sets: await listFactorSets(memberOf(res).organizationId) });
});

export const postFactorSets = handled(async (req, res) => {
  const parsed = factorSetsBodySchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  const duplicate = duplicateYearCarrier(parsed.data.sets);
  if (duplicate)
    return sendError(
      res,
      400,
      "invalid_body",
      "The request body is not valid.",
      [{ path: "sets", message: `${duplicate} is listed twice.` }],
    );
  const member = memberOf(res);
  const saved = await saveFactorSets(
    member.organizationId,
    auditActorOf(member),
    parsed.data.sets,
  );
  res.status(201).json({ sets: saved.sets, adjusted_months: saved.adjusted });
});

function duplicateYearCarrier(
  sets: readonly { year: number; carrier: string }[],
): string | null {
  const seen = new Set<string>();
  for (const s of sets) {
    const key = `${s.year} ${s.carrier}`;
    if (seen.has(key)) return key;
    seen.add(key);
  }
  return null;
}

export const getContracts = handled(async (_req, res) => {
  res.json({ contracts: await listContracts(memberOf(res).organizationId) });
});

export const postContract = handled(async (req, res) => {
  const parsed = contractInputSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  const member = memberOf(res);
  try {
    const saved = await createContract(
      member.organizationId,
      auditActorOf(member),
      parsed.data,
    );
    res
      .status(201)
      .json({ ...saved.contract, adjusted_months: saved.adjusted });
  } catch (error) {
    if (error instanceof ContractMeterError)
      return sendError(res, 400, "invalid_body", error.message, [
        { path: "meter_id", message: error.message },
      ]);
    throw error;
  }
});
