import type { Request, Response } from "express";
import { evaluateItems, evaluateRequestSchema } from "~/physics/evaluate";
import { sendValidationError } from "./respond.server";

/** 10,000 items of a few hundred bytes each fit comfortably. */
export const EVALUATE_BODY_LIMIT = "8mb";

/**
 * POST /api/v1/energy/evaluate: pure computation, nothing stored. The
 * envelope is validated as a whole; each item on its own, so one bad item
 * answers `ok: false` in its place and never fails the others.
 */
export function evaluateEnergy(req: Request, res: Response): void {
  const parsed = evaluateRequestSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  res.json({ results: evaluateItems(parsed.data.items) });
}
