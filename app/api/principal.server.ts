/**
 * The API's access checks. Each request's signed-in person is resolved at
 * most once (`RequestPrincipal`, the pages' resolver too) and kept in
 * `res.locals`; every check asks `can(role, permission)` of the one
 * permission table, as pages do.
 */
import type { NextFunction, Request, Response } from "express";
import {
  authenticateGateway,
  type GatewayPrincipal,
} from "~/auth/gateway.server";
import { bearerToken } from "~/auth/gateway-keys.server";
import { can, type Permission, type Role } from "~/auth/permissions";
import { RequestPrincipal } from "~/auth/request-principal.server";
import { sendError } from "./respond.server";

export interface UserPrincipal {
  kind: "user";
  userId: string;
}

export type ApiPrincipal = GatewayPrincipal | UserPrincipal;

declare module "express-serve-static-core" {
  interface Locals {
    /** The signed-in person, once resolved (null: nobody is signed in). */
    person?: RequestPrincipal | null;
    /** Who called a gateway route: a gateway's key or a signed-in person. */
    principal?: ApiPrincipal;
    /** Who called a member route, and for which organisation. */
    member?: { userId: string; organizationId: string; role: Role };
  }
}

/** The request's signed-in person: its session validated once per request. */
async function signedInPerson(
  req: Request,
  res: Response,
): Promise<RequestPrincipal | null> {
  if (res.locals.person === undefined) {
    const url = `${req.protocol}://${req.get("host") ?? "localhost"}${req.originalUrl}`;
    res.locals.person = await RequestPrincipal.resolve(
      new globalThis.Request(url, {
        headers: { cookie: req.get("cookie") ?? "" },
      }),
    );
  }
  return res.locals.person;
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
      const person = options.allowSession
        ? await signedInPerson(req, res)
        : null;
      if (person) {
        res.locals.principal = { kind: "user", userId: person.user.id };
        return next();
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

/**
 * Session-authenticated routes under /orgs/:orgId: the signed-in person must
 * be a member (else 404, as for pages) whose role has the permission (else
 * 403).
 */
export function requireOrgMember(permission: Permission) {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const person = await signedInPerson(req, res);
      if (!person)
        return sendError(res, 401, "unauthenticated", "Sign in first.");
      const membership = await person.membershipOf(String(req.params.orgId));
      if (!membership)
        return sendError(res, 404, "not_found", "No such organisation.");
      if (!can(membership.role, permission))
        return sendError(
          res,
          403,
          "forbidden",
          "Your role does not allow this.",
        );
      res.locals.member = {
        userId: person.user.id,
        organizationId: membership.organization.id,
        role: membership.role,
      };
      next();
    } catch (error) {
      next(error);
    }
  };
}
