import type { ErrorRequestHandler, Response } from "express";
import type { z } from "zod";
import { isOutage, sendUnavailable } from "~/db/unavailable.server";
import type { ApiErrorBody } from "./schemas";

export type { ApiErrorBody };

export function sendError(
  res: Response,
  status: number,
  code: string,
  message: string,
  issues?: ApiErrorBody["error"]["issues"],
): void {
  const body: ApiErrorBody = {
    error: { code, message, ...(issues ? { issues } : {}) },
  };
  res.status(status).json(body);
}

/** zod issues as `path: message` pairs, the path written like `items.3.volume_m3`. */
export function zodIssues(error: z.ZodError) {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join(".") || "(body)",
    message: issue.message,
  }));
}

export function sendValidationError(res: Response, error: z.ZodError): void {
  sendError(
    res,
    400,
    "invalid_body",
    "The request body is not valid.",
    zodIssues(error),
  );
}

/** Body-parser failures (bad JSON, too large) and anything unexpected. */
export const apiErrorHandler: ErrorRequestHandler = (err, _req, res, _next) => {
  const type = (err as { type?: string }).type;
  if (type === "entity.parse.failed") {
    return sendError(res, 400, "invalid_json", "The body is not valid JSON.");
  }
  if (type === "entity.too.large") {
    return sendError(
      res,
      413,
      "body_too_large",
      "The body is larger than this endpoint accepts.",
    );
  }
  if (type === "encoding.unsupported" || type === "charset.unsupported") {
    return sendError(
      res,
      415,
      "unsupported_encoding",
      "Send the body as UTF-8 JSON.",
    );
  }
  // The database went away mid-request: nothing was committed, so the
  // client may send the same request again.
  if (isOutage(err)) return sendUnavailable(res, true);
  console.error("[api] unexpected error", err);
  sendError(
    res,
    500,
    "internal_error",
    "Something went wrong on our side; nothing was changed.",
  );
};
