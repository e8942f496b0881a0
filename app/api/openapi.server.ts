/**
 * The OpenAPI 3.1 description of /api/v1, served at /api/v1/openapi.json.
 * Nothing in it is written by hand but prose: paths, parameters, bodies and
 * answers come from the route table (routes.server.ts) and the zod schemas
 * its handlers parse and answer with, turned into JSON Schema 2020-12 (the
 * dialect of OpenAPI 3.1) by zod-openapi.
 */
import {
  createDocument,
  type ZodOpenApiOperationObject,
  type ZodOpenApiPathsObject,
  type ZodOpenApiResponseObject,
} from "zod-openapi";
import { can, roles } from "~/auth/permissions";
import { evaluateComponents } from "~/physics/evaluate-schema";
import { reportSummarySchema } from "~/reports/report-summary";
import type { Access, ApiRoute, Reply, RequestBody } from "./api-route.server";
import { errorReply } from "./api-route.server";
import {
  carrierTotalSchema,
  errorBodySchema,
  healthSchema,
  ingestAnswerSchema,
  intervalPageSchema,
  intervalSchema,
  itemProblemSchema,
  ledgerRowSchema,
  ledgerSchema,
  verifyOutcomeSchema,
} from "./schemas";

const DESCRIPTION =
  "Meter gateways and signed-in tools call this API. Evaluated energy and stored hours are signed by the IUPAC convention: what enters a site is positive (chilled water negative). The ledger shows delivered (imports_kwh >= 0) and exported (exports_kwh <= 0) energy per carrier, chilled water as cooling delivered, never added across carriers. Figures are for energy management; billing third parties needs meters approved under local legal-metrology rules.";

/**
 * Schemas named in `components.schemas`; every use of one becomes a $ref.
 * (ReadingBatch and Reading carry their names themselves: reading-schema.ts.)
 */
const NAMED_SCHEMAS = {
  Error: errorBodySchema,
  Health: healthSchema,
  IngestAnswer: ingestAnswerSchema,
  ItemProblem: itemProblemSchema,
  Ledger: ledgerSchema,
  LedgerRow: ledgerRowSchema,
  CarrierTotal: carrierTotalSchema,
  IntervalPage: intervalPageSchema,
  Interval: intervalSchema,
  ReportSummary: reportSummarySchema,
  VerifyOutcome: verifyOutcomeSchema,
  ...evaluateComponents,
};

/** Express's `/orgs/:orgId` is OpenAPI's `/orgs/{orgId}`. */
export function openApiPath(expressPath: string): string {
  return expressPath.replace(/:(\w+)/g, "{$1}");
}

function security(access: Access): Record<string, string[]>[] {
  switch (access.kind) {
    case "anyone":
    case "stripe":
      return [];
    case "gateway":
      return [{ gatewayKey: [] }];
    case "gatewayOrSession":
      return [{ gatewayKey: [] }, { session: [] }];
    case "member":
      return [{ apiToken: [] }, { session: [] }];
  }
}

/** The answers that follow from who may call and what is sent. */
function impliedReplies(route: ApiRoute): Record<number, Reply> {
  const replies: Record<number, Reply> = {};
  const { access, body } = route;
  if (access.kind === "gateway") {
    replies[401] = errorReply("No valid gateway key");
  }
  if (access.kind === "gatewayOrSession") {
    replies[401] = errorReply("No valid gateway key or session");
  }
  if (access.kind === "member") {
    replies[401] = errorReply(
      "Not signed in, or an API token that is unknown, revoked or expired (`invalid_token`)",
    );
    if (roles.some((role) => !can(role, access.permission))) {
      replies[403] = errorReply(
        "The member's (or the API token's) role does not allow this",
      );
    }
    replies[404] = errorReply(
      "Not a member of this organisation (also a token of another organisation)",
    );
  }
  if (body?.kind === "json") {
    replies[400] = errorReply(
      "Not JSON (`invalid_json`), or not this body (`invalid_body`, with issues)",
    );
    replies[415] = errorReply("The body is not UTF-8");
  }
  if (body) replies[413] = errorReply(`Body larger than ${body.limit}`);
  if (route.path !== "/health") {
    replies[503] = {
      ...errorReply(
        "The database is away (`database_unavailable`); nothing was stored, send the request again",
      ),
      headers: { "Retry-After": "Seconds to wait, 5" },
    };
  }
  return replies;
}

function response(reply: Reply): ZodOpenApiResponseObject {
  const { description, content, headers } = reply;
  return {
    description,
    ...(headers && {
      headers: Object.fromEntries(
        Object.entries(headers).map(([name, about]) => [
          name,
          { description: about, schema: { type: "string" } },
        ]),
      ),
    }),
    ...(content && {
      content: {
        [content.mediaType]: {
          schema: content.schema ?? bytesSchema(content.mediaType),
        },
      },
    }),
  };
}

function bytesSchema(mediaType: string) {
  return mediaType.startsWith("text/")
    ? { type: "string" as const }
    : { type: "string" as const, format: "binary" };
}

function requestBody(body: RequestBody) {
  const mediaType = body.kind === "json" ? "application/json" : body.mediaType;
  return {
    required: true,
    content: {
      [mediaType]: {
        schema: body.schema ?? bytesSchema(mediaType),
        ...(body.kind === "json" && { example: body.example }),
      },
    },
  };
}

function operation(route: ApiRoute): ZodOpenApiOperationObject {
  const replies = { ...impliedReplies(route), ...route.responses };
  return {
    summary: route.summary,
    ...(route.description && { description: route.description }),
    security: security(route.access),
    requestParams: {
      ...(route.params && { path: route.params }),
      ...(route.query && { query: route.query }),
      ...(route.headers && { header: route.headers }),
    },
    ...(route.body && { requestBody: requestBody(route.body) }),
    responses: Object.fromEntries(
      Object.keys(replies)
        .map(Number)
        .sort((a, b) => a - b)
        .map((status) => [String(status), response(replies[status])]),
    ),
  };
}

/** The document for these routes (the router's own table). */
export function openApiDocument(routes: readonly ApiRoute[]) {
  const paths: ZodOpenApiPathsObject = {};
  for (const route of routes) {
    const path = openApiPath(route.path);
    paths[path] = { ...paths[path], [route.method]: operation(route) };
  }
  return createDocument({
    openapi: "3.1.0",
    info: {
      title: "Joulebook API",
      version: "1.0.0",
      description: DESCRIPTION,
    },
    servers: [{ url: "/api/v1" }],
    security: [{ gatewayKey: [] }, { apiToken: [] }, { session: [] }],
    paths,
    components: {
      securitySchemes: {
        gatewayKey: {
          type: "http",
          scheme: "bearer",
          description:
            "A gateway's API key (`jbgw_…`), shown once when the gateway is created. Posts readings only.",
        },
        apiToken: {
          type: "http",
          scheme: "bearer",
          description:
            "An organisation API token (`jbtk_…`), made by an owner on the API tokens page and shown once. It acts with its role (auditor: read-only; energy manager) on `/orgs/{orgId}/…` of its own organisation only; elsewhere it is answered as a non-member (404). A revoked or expired token gets 401 `invalid_token`.",
        },
        session: { type: "apiKey", in: "cookie", name: "jb_session" },
      },
      schemas: NAMED_SCHEMAS,
    },
  });
}
