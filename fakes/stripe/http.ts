/**
 * HTTP plumbing of the API half: key check, idempotent replays, reading the
 * parameters the SDK sends, and answering with (optionally expanded) objects.
 */
import type { Request, RequestHandler, Response, Router } from "express";
import { expandPaths, type Ctx } from "./context";
import { parse, StripeFakeError } from "./errors";
import { onlyExpand } from "./params";
import { newId } from "./store";

/** The SDK puts GET and DELETE parameters in the query, others in the body. */
export function input(req: Request): unknown {
  if (req.method === "GET" || req.method === "DELETE") return req.query;
  return req.body ?? {};
}

export function reply(
  ctx: Ctx,
  res: Response,
  body: object,
  expand?: string[],
): void {
  res.json(expandPaths(ctx, body, expand));
}

/** `GET <path>/:id`: one object by id, with `expand[]` as the only parameter. */
export function retrieveRoute(
  r: Router,
  ctx: Ctx,
  path: string,
  find: (id: string) => object,
): void {
  r.get(`${path}/:id`, (req, res) => {
    const p = parse(onlyExpand, input(req));
    reply(ctx, res, find(String(req.params.id)), p.expand);
  });
}

export const requestId: RequestHandler = (_req, res, next) => {
  res.set("Request-Id", newId("req"));
  next();
};

export const requireTestKey: RequestHandler = (req, res, next) => {
  const match = /^Bearer (\S+)$/.exec(req.get("authorization") ?? "");
  const fail = (message: string) =>
    res
      .status(401)
      .json(new StripeFakeError(401, "invalid_request_error", message).body());
  if (!match)
    return fail(
      "You did not provide an API key. Send it in the Authorization header as 'Bearer sk_test_…'.",
    );
  if (!match[1].startsWith("sk_test_"))
    return fail(
      `Invalid API Key provided: ${match[1].slice(0, 8)}****. The local Stripe fake accepts test secret keys (sk_test_…) only.`,
    );
  next();
};

interface Remembered {
  fingerprint: string;
  status: number;
  body: unknown;
}

const MAX_KEYS = 5000;

/**
 * Stripe's idempotency: the same key with the same request replays the first
 * answer; the same key with another request is refused. Answers to requests
 * that failed validation are not remembered, as on Stripe.
 */
export function idempotency(): RequestHandler {
  const seen = new Map<string, Remembered>();
  return (req, res, next) => {
    const key = req.get("idempotency-key");
    if (req.method !== "POST" || !key) return next();
    const fingerprint = `${req.method} ${req.path} ${JSON.stringify(req.body ?? {})}`;
    const earlier = seen.get(key);
    if (earlier && earlier.fingerprint !== fingerprint) {
      const message = `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`;
      res
        .status(400)
        .json(new StripeFakeError(400, "idempotency_error", message).body());
      return;
    }
    if (earlier) {
      res.set("Idempotent-Replayed", "true");
      res.status(earlier.status).json(earlier.body);
      return;
    }
    const send = res.json.bind(res);
    res.json = (body: unknown) => {
      if (res.statusCode < 400 || res.statusCode === 402) {
        if (seen.size >= MAX_KEYS) seen.delete(seen.keys().next().value!);
        seen.set(key, { fingerprint, status: res.statusCode, body });
      }
      return send(body);
    };
    next();
  };
}
