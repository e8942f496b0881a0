/**
 * What one entry of the API's route table (routes.server.ts) says. Each
 * entry is read twice: router.server.ts registers it with Express (access
 * check, body parser, handler) and openapi.server.ts describes it in
 * /api/v1/openapi.json, from the same zod schemas the handler uses.
 */
import type { RequestHandler } from "express";
import type { z } from "zod";
import type { Permission } from "~/auth/permissions";
import { errorBodySchema } from "./schemas";

/** Who may call a route: the middleware that checks it and the document's `security` both follow from it. */
export type Access =
  /** No credentials (health, the document itself). */
  | { kind: "anyone" }
  /** Stripe's servers; the handler checks the Stripe-Signature header. */
  | { kind: "stripe" }
  /** A gateway's key (Authorization: Bearer), nothing else. */
  | { kind: "gateway" }
  /** A gateway's key or a signed-in session. */
  | { kind: "gatewayOrSession" }
  /** A signed-in member of `:orgId` whose role has the permission. */
  | { kind: "member"; permission: Permission };

export const anyone: Access = { kind: "anyone" };
export const member = (permission: Permission): Access => ({
  kind: "member",
  permission,
});

export type RequestBody =
  /** Parsed by express.json; `schema` is a body every part of which is valid. */
  | { kind: "json"; limit: string; schema: z.ZodType; example: unknown }
  /**
   * Handed to the handler as bytes (express.raw) for the handler to read
   * itself; `schema` describes the bytes when they are JSON.
   */
  | {
      kind: "raw";
      mediaType: "application/json" | "application/pdf";
      limit: string;
      schema?: z.ZodType;
    };

export interface Reply {
  description: string;
  /** The media type and, for JSON, the body's schema; none for an empty answer. */
  content?: { mediaType: string; schema?: z.ZodType };
  /** Response headers worth naming, with what they carry. */
  headers?: Record<string, string>;
}

export const jsonReply = (description: string, schema: z.ZodType): Reply => ({
  description,
  content: { mediaType: "application/json", schema },
});

/** An answer in the common error shape (`{ error: { code, message, issues? } }`). */
export const errorReply = (description: string): Reply =>
  jsonReply(description, errorBodySchema);

/** Bytes of a file: a PDF, a CSV, a spreadsheet. */
export const fileReply = (
  description: string,
  mediaType: string,
  headers?: Record<string, string>,
): Reply => ({ description, content: { mediaType }, headers });

export interface ApiRoute {
  method: "get" | "post" | "patch" | "delete";
  /** Express path under /api/v1, e.g. "/orgs/:orgId/ledger". */
  path: string;
  summary: string;
  description?: string;
  access: Access;
  /** One schema per `:param` of the path. */
  params?: z.ZodObject;
  query?: z.ZodObject;
  /** Request headers the route reads (besides authentication). */
  headers?: z.ZodObject;
  body?: RequestBody;
  /** Middleware between the access check and the body parser (a rate limit). */
  before?: RequestHandler[];
  handler: RequestHandler;
  /**
   * What the route answers, by status. The errors that follow from `access`
   * and `body` (401, 403, 404, 400, 413, 415, 503) are added to the document
   * for you; name one here only to word it for this route.
   */
  responses: Record<number, Reply>;
}
