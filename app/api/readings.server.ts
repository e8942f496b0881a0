import type { NextFunction, Request, Response } from "express";
import { rateLimit } from "express-rate-limit";
import { z } from "zod";
import { env } from "~/env.server";
import { ingestReadings } from "~/ingest/ingest-readings.server";
import { MAX_READINGS_PER_BATCH } from "~/ingest/reading-schema";
import { sendError, sendValidationError } from "./respond.server";

export const READINGS_BODY_LIMIT = "5mb";

const batchSchema = z.strictObject({
  readings: z
    .array(z.unknown(), { error: "readings: expected an array of readings" })
    .min(1, "readings: send at least one reading"),
});

/**
 * Per gateway, not per address: many gateways may sit behind one NAT, and
 * one misbehaving gateway must not starve the others.
 */
export function gatewayRateLimit() {
  return rateLimit({
    windowMs: 60_000,
    limit: () => env().GATEWAY_RATE_LIMIT_PER_MINUTE,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    keyGenerator: (_req, res) => {
      const principal = res.locals.principal;
      return principal?.kind === "gateway" ? principal.gatewayId : "anonymous";
    },
    handler: (_req, res, _next, options) => {
      res.setHeader("Retry-After", String(Math.ceil(options.windowMs / 1000)));
      sendError(
        res,
        429,
        "rate_limited",
        "Too many batches from this gateway; retry after the time in Retry-After.",
      );
    },
  });
}

/** POST /api/v1/readings: a gateway's batch; acknowledged only after commit. */
export async function postReadings(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const principal = res.locals.principal;
  if (principal?.kind !== "gateway") {
    return sendError(
      res,
      401,
      "unauthenticated",
      "Readings are posted with a gateway key.",
    );
  }
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
      organizationId: principal.organizationId,
      gatewayId: principal.gatewayId,
      source: "api",
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
