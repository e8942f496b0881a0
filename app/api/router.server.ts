import express, { Router, type RequestHandler } from "express";
import type { Access, RequestBody } from "./api-route.server";
import { requireOrgMember, requirePrincipal } from "./principal.server";
import { apiRoutes } from "./routes.server";
import { apiErrorHandler, sendError } from "./respond.server";

/** The middleware that lets only `access` through. */
function accessCheck(access: Access): RequestHandler[] {
  switch (access.kind) {
    case "anyone":
    case "stripe": // the handler checks Stripe's signature over the raw body
      return [];
    case "gateway":
      return [requirePrincipal({ allowSession: false })];
    case "gatewayOrSession":
      return [requirePrincipal({ allowSession: true })];
    case "member":
      return [requireOrgMember(access.permission)];
  }
}

/** Each route parses its own body, so no parser runs before a raw route's. */
function bodyParser(body: RequestBody | undefined): RequestHandler[] {
  if (!body) return [];
  if (body.kind === "json") {
    return [express.json({ limit: body.limit, strict: true })];
  }
  return [express.raw({ type: body.mediaType, limit: body.limit })];
}

/** The JSON API under /api/v1: the route table (routes.server.ts), in order. */
export function apiRouter(): Router {
  const router = Router();
  for (const route of apiRoutes()) {
    router[route.method](
      route.path,
      ...accessCheck(route.access),
      ...(route.before ?? []),
      ...bodyParser(route.body),
      route.handler,
    );
  }
  router.use((_req, res) => {
    sendError(
      res,
      404,
      "not_found",
      "No such API route. See /api/v1/openapi.json.",
    );
  });
  router.use(apiErrorHandler);
  return router;
}
