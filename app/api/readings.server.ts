import type { NextFunction, Request, Response } from "express";
import { rateLimit } from "express-rate-limit";
import { env } from "~/env.server";
import { handleBatch } from "./ingest-batch.server";
import { PostgresRateLimitStore } from "./rate-limit-store.server";
import { sendError } from "./respond.server";

export { READINGS_BODY_LIMIT } from "./ingest-batch.server";

/**
 * Per gateway, not per address: many gateways may sit behind one NAT, and
 * one misbehaving gateway must not starve the others. Counted in PostgreSQL,
 * so all server processes limit a gateway as one.
 */
export function gatewayRateLimit() {
  return rateLimit({
    windowMs: 60_000,
    store: new PostgresRateLimitStore("gateway"),
    // Should the count fail (the database away), the batch goes on to the
    // write path, which answers 503 by itself; the limit never answers 500.
    passOnStoreError: true,
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
export function postReadings(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> | void {
  const principal = res.locals.principal;
  if (principal?.kind !== "gateway") {
    return sendError(
      res,
      401,
      "unauthenticated",
      "Readings are posted with a gateway key.",
    );
  }
  return handleBatch(req, res, next, {
    organizationId: principal.organizationId,
    gatewayId: principal.gatewayId,
    source: "api",
  });
}
