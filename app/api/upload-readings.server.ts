import type { NextFunction, Request, Response } from "express";
import { handleBatch } from "./ingest-batch.server";

/**
 * POST /api/v1/orgs/:orgId/readings: a chunk of an uploaded CSV, sent by the
 * signed-in manager's browser, or a batch an integration posts with an
 * organisation API token; same checks and store as a gateway's batch. The
 * batch records which of the two sent it.
 */
export function uploadReadings(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const { organizationId, userId, tokenId } = res.locals.member!;
  return handleBatch(
    req,
    res,
    next,
    tokenId
      ? { organizationId, apiTokenId: tokenId, source: "api_token" }
      : { organizationId, userId, source: "csv" },
  );
}
