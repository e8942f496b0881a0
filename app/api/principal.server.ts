/**
 * The API's access checks. Each request's signed-in person is resolved at
 * most once (`RequestPrincipal`, the pages' resolver too) and kept in
 * `res.locals`; every check asks `can(role, permission)` of the one
 * permission table, as pages do.
 */
import type { NextFunction, Request, Response } from "express";
import { isApiTokenSecret } from "~/auth/api-token-keys.server";
import { authenticateApiToken } from "~/auth/api-token.server";
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

/**
 * The caller of a member route: a signed-in member (userId), or an
 * organisation API token acting with its own role (tokenId, userId null).
 * Handlers record `userId`/`tokenId` as the audit entry's actor.
 */
export type MemberCaller = {
  organizationId: string;
  role: Role;
} & ({ userId: string; tokenId: null } | { userId: null; tokenId: string });

/** The audit actor of a member route's caller, for the domain's writes. */
export function auditActorOf(member: MemberCaller) {
  return { actorUserId: member.userId, actorTokenId: member.tokenId };
}

declare module "express-serve-static-core" {
  interface Locals {
    /** The signed-in person, once resolved (null: nobody is signed in). */
    person?: RequestPrincipal | null;
    /** Who called a gateway route: a gateway's key or a signed-in person. */
    principal?: ApiPrincipal;
    /** Who called a member route, and for which organisation. */
    member?: MemberCaller;
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

/** What a caller outside `:orgId` gets, token or person: nothing about it. */
const sendNotAMember = (res: Response) =>
  sendError(res, 404, "not_found", "No such organisation.");

/**
 * The caller an `Authorization: Bearer` secret stands for on a member route:
 * an organisation API token, or a 401 that says why not. A token belongs to
 * one organisation; for any other it answers exactly as for a non-member.
 */
async function tokenCaller(
  secret: string,
  orgId: string,
  res: Response,
): Promise<MemberCaller | null> {
  if (!isApiTokenSecret(secret)) {
    sendError(
      res,
      401,
      "invalid_token",
      "Organisation routes take an API token (jbtk_…) or a signed-in session; gateway keys only post readings.",
    );
    return null;
  }
  const check = await authenticateApiToken(secret);
  if (!check.ok) {
    sendError(res, 401, "invalid_token", check.message);
    return null;
  }
  if (check.token.organizationId !== orgId) {
    sendNotAMember(res);
    return null;
  }
  return {
    organizationId: check.token.organizationId,
    role: check.token.role,
    userId: null,
    tokenId: check.token.tokenId,
  };
}

/** The signed-in member of `orgId`, or the 401/404 answer already sent. */
async function sessionCaller(
  req: Request,
  res: Response,
  orgId: string,
): Promise<MemberCaller | null> {
  const person = await signedInPerson(req, res);
  if (!person) {
    sendError(
      res,
      401,
      "unauthenticated",
      "Sign in first, or send an API token as `Authorization: Bearer <token>`.",
    );
    return null;
  }
  const membership = await person.membershipOf(orgId);
  if (!membership) {
    sendNotAMember(res);
    return null;
  }
  return {
    organizationId: membership.organization.id,
    role: membership.role,
    userId: person.user.id,
    tokenId: null,
  };
}

/**
 * Routes under /orgs/:orgId: the caller is an organisation API token
 * (Authorization: Bearer jbtk_…) or a signed-in person; either must belong
 * to the organisation (else 404, as for pages) and its role must have the
 * permission (else 403), by the same `can(role, permission)`.
 */
export function requireOrgMember(permission: Permission) {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const orgId = String(req.params.orgId);
      const secret = bearerToken(req.get("authorization"));
      const member = secret
        ? await tokenCaller(secret, orgId, res)
        : await sessionCaller(req, res, orgId);
      if (!member) return;
      if (!can(member.role, permission))
        return sendError(
          res,
          403,
          "forbidden",
          "Your role does not allow this.",
        );
      res.locals.member = member;
      next();
    } catch (error) {
      next(error);
    }
  };
}
