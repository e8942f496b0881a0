import type { NextFunction, Request, Response } from "express";
import { handleBatch } from "./ingest-batch.server";

/**
 * POST /api/v1/orgs/:orgId/readings: a chunk of an uploaded CSV, sent by the
 * signed-in manager's browser; same checks and store as a gateway's batch.
 */
export function uploadReadings(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const { organizationId, userId } = res.locals.member!;
  return handleBatch(req, res, next, { organizationId, userId, source: "csv" });
}
