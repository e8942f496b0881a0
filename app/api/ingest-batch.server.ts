import type { NextFunction, Request, Response } from "express";
import { z } from "zod";
import {
  ingestReadings,
  type IngestRequest,
} from "~/ingest/ingest-readings.server";
import { MAX_READINGS_PER_BATCH } from "~/ingest/reading-schema";
import { sendError, sendValidationError } from "./respond.server";
import type { IngestAnswer } from "./schemas";

export const READINGS_BODY_LIMIT = "5mb";

/**
 * The envelope alone: each reading is then checked on its own, so a bad one is
 * rejected in its place. The API document shows the body with every reading
 * well formed (wellFormedReadingBatchSchema).
 */
const batchSchema = z.strictObject({
  readings: z
    .array(z.unknown(), { error: "readings: expected an array of readings" })
    .min(1, "readings: send at least one reading"),
});

/**
 * The body check, store and answer shared by a gateway's batch and a signed-in
 * upload: `{ readings }`, at most 5,000, answered only after the commit.
 */
export async function handleBatch(
  req: Request,
  res: Response,
  next: NextFunction,
  who: Omit<IngestRequest, "readings">,
): Promise<void> {
  const parsed = batchSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  if (parsed.data.readings.length > MAX_READINGS_PER_BATCH) {
    return sendError(
      res,
      413,
      "batch_too_large",
      `A batch holds at most ${MAX_READINGS_PER_BATCH} readings; split it.`,
    );
  }
  try {
    const result = await ingestReadings({
      ...who,
      readings: parsed.data.readings,
    });
    const answer: IngestAnswer = {
      batch_id: result.batchId,
      accepted: result.accepted,
      repeats: result.repeats,
      rejected: result.rejected,
      conflicts: result.conflicts,
    };
    res.json(answer);
  } catch (error) {
    next(error);
  }
}
