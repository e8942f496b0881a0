import type { NextFunction, Request, Response } from "express";
import { z } from "zod";
import { ingestReadings } from "~/ingest/ingest-readings.server";
import { MAX_READINGS_PER_BATCH } from "~/ingest/reading-schema";
import { sendError, sendValidationError } from "./respond.server";

const uploadSchema = z.strictObject({
  readings: z.array(z.unknown()).min(1, "readings: send at least one reading"),
});

/**
 * POST /api/v1/orgs/:orgId/readings: a chunk of an uploaded CSV, sent by the
 * signed-in manager's browser; same checks and store as a gateway's batch.
 */
export async function uploadReadings(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const { organizationId, userId } = res.locals.member!;
  const parsed = uploadSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  if (parsed.data.readings.length > MAX_READINGS_PER_BATCH) {
    return sendError(
      res,
      413,
      "batch_too_large",
      `Send at most ${MAX_READINGS_PER_BATCH} readings per request.`,
    );
  }
  try {
    const result = await ingestReadings({
      organizationId,
      userId,
      source: "csv",
      readings: parsed.data.readings,
    });
    res.json({
      batch_id: result.batchId,
      accepted: result.accepted,
      repeats: result.repeats,
      rejected: result.rejected,
      conflicts: result.conflicts,
    });
  } catch (error) {
    next(error);
  }
}
