/**
 * Failures in Stripe's shape. The SDK decides between success and failure by
 * the presence of an `error` key and picks its error class from the status,
 * so every failure of the fake goes through StripeFakeError.
 */
import type { ErrorRequestHandler } from "express";
import { z } from "zod";

type ErrorType =
  "invalid_request_error" | "card_error" | "api_error" | "idempotency_error";

interface ErrorDetails {
  code?: string;
  param?: string;
  decline_code?: string;
}

export class StripeFakeError extends Error {
  constructor(
    readonly status: number,
    readonly type: ErrorType,
    message: string,
    readonly details: ErrorDetails = {},
  ) {
    super(message);
  }

  body() {
    return {
      error: { type: this.type, message: this.message, ...this.details },
    };
  }
}

export function notFound(kind: string, id: string, param = "id") {
  return new StripeFakeError(
    404,
    "invalid_request_error",
    `No such ${kind}: '${id}'`,
    { code: "resource_missing", param },
  );
}

export function invalid(param: string | undefined, message: string) {
  return new StripeFakeError(400, "invalid_request_error", message, {
    code: "parameter_invalid",
    ...(param ? { param } : {}),
  });
}

export function unsupported(message: string, param?: string) {
  return new StripeFakeError(
    400,
    "invalid_request_error",
    `${message} (not supported by the local Stripe fake)`,
    { code: "parameter_unknown", ...(param ? { param } : {}) },
  );
}

/** `items.0.price` → `items[0][price]`, the way Stripe names parameters. */
export function paramName(path: readonly PropertyKey[]): string {
  const [head, ...rest] = path.map(String);
  return head + rest.map((p) => `[${p}]`).join("");
}

export function fromZod(error: z.ZodError): StripeFakeError {
  const issue = error.issues[0];
  if (issue.code === "unrecognized_keys") {
    const param = paramName([...issue.path, issue.keys[0]]);
    return unsupported(`Received unknown parameter: ${param}`, param);
  }
  const param = paramName(issue.path);
  // zod does not keep the input, but names what it received.
  const missing = issue.message.endsWith("received undefined");
  if (issue.code === "invalid_type" && missing) {
    return new StripeFakeError(
      400,
      "invalid_request_error",
      `Missing required param: ${param}.`,
      { code: "parameter_missing", param },
    );
  }
  return invalid(param, `Invalid ${param}: ${issue.message}`);
}

export function parse<T extends z.ZodType>(
  schema: T,
  input: unknown,
): z.output<T> {
  const result = schema.safeParse(input ?? {});
  if (!result.success) throw fromZod(result.error);
  return result.data;
}

/** The last middleware: anything thrown becomes a Stripe-shaped answer. */
export const stripeErrorHandler: ErrorRequestHandler = (
  err,
  _req,
  res,
  _next,
) => {
  if (err instanceof StripeFakeError) {
    res.status(err.status).json(err.body());
    return;
  }
  const status = Number(err?.status ?? err?.statusCode);
  if (status >= 400 && status < 500) {
    res
      .status(400)
      .json(invalid(undefined, `Malformed request: ${err.message}`).body());
    return;
  }
  console.error("[stripe-fake]", err);
  res
    .status(500)
    .json(
      new StripeFakeError(
        500,
        "api_error",
        `Fake error: ${err?.message}`,
      ).body(),
    );
};
