import type { NextFunction, Request, Response } from "express";
import { findMembership } from "~/auth/membership.server";
import { can, type Permission } from "~/auth/permissions";
import { getCurrentSession } from "~/auth/session.server";
import { sendError } from "./respond.server";

declare module "express-serve-static-core" {
  interface Locals {
    member?: { userId: string; organizationId: string };
  }
}

/**
 * Session-authenticated API routes under /orgs/:orgId: the signed-in user must
 * be a member (else 404, as for pages) with the permission (else 403).
 */
export function requireOrgMember(permission: Permission) {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const url = `${req.protocol}://${req.get("host") ?? "localhost"}${req.originalUrl}`;
      const current = await getCurrentSession(
        new globalThis.Request(url, {
          headers: { cookie: req.get("cookie") ?? "" },
        }),
      );
      if (!current)
        return sendError(res, 401, "unauthenticated", "Sign in first.");
      const membership = await findMembership(
        current.user.id,
        String(req.params.orgId),
      );
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
        userId: current.user.id,
        organizationId: membership.id,
      };
      next();
    } catch (error) {
      next(error);
    }
  };
}
