import type { NextFunction, Request, Response } from "express";
import {
  authenticateGateway,
  type GatewayPrincipal,
} from "~/auth/gateway.server";
import { bearerToken } from "~/auth/gateway-keys.server";
import { getCurrentSession } from "~/auth/session.server";
import { sendError } from "./respond.server";

export interface UserPrincipal {
  kind: "user";
  userId: string;
}

export type ApiPrincipal = GatewayPrincipal | UserPrincipal;

declare module "express-serve-static-core" {
  interface Locals {
    principal?: ApiPrincipal;
  }
}

/** A Fetch API request carrying only the cookie, for the session check. */
function cookieRequest(req: Request): globalThis.Request {
  const url = `${req.protocol}://${req.get("host") ?? "localhost"}${req.originalUrl}`;
  return new globalThis.Request(url, {
    headers: { cookie: req.get("cookie") ?? "" },
  });
}

/**
 * Accepts a gateway key (Authorization: Bearer) or, where `allowSession` is
 * set, a signed-in session cookie. Anything else answers 401.
 */
export function requirePrincipal(options: { allowSession: boolean }) {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const key = bearerToken(req.get("authorization"));
      if (key) {
        const gateway = await authenticateGateway(key);
        if (!gateway) {
          return sendError(
            res,
            401,
            "invalid_key",
            "The API key is unknown or revoked.",
          );
        }
        res.locals.principal = gateway;
        return next();
      }
      if (options.allowSession) {
        const current = await getCurrentSession(cookieRequest(req));
        if (current) {
          res.locals.principal = { kind: "user", userId: current.user.id };
          return next();
        }
      }
      sendError(
        res,
        401,
        "unauthenticated",
        "Send a gateway key as `Authorization: Bearer <key>`.",
      );
    } catch (error) {
      next(error);
    }
  };
}
