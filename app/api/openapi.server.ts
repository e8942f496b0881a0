import { auditKinds } from "~/audit/kinds";
import { evaluateOpenApi } from "~/physics/evaluate";

const errorSchema = {
  type: "object",
  required: ["error"],
  properties: {
    error: {
      type: "object",
      required: ["code", "message"],
      properties: {
        code: { type: "string" },
        message: { type: "string" },
        issues: {
          type: "array",
          items: {
            type: "object",
            properties: {
              path: { type: "string" },
              message: { type: "string" },
            },
          },
        },
      },
    },
  },
};

const errorResponse = (description: string) => ({
  description,
  content: {
    "application/json": { schema: { $ref: "#/components/schemas/Error" } },
  },
});

const jsonResponse = (description: string) => ({
  description,
  content: { "application/json": { schema: { type: "object" } } },
});

const orgIdParameter = {
  name: "orgId",
  in: "path",
  required: true,
  schema: { type: "string", format: "uuid" },
};

const queryParameter = (
  name: string,
  schema: Record<string, unknown>,
  description: string,
) => ({ name, in: "query", schema, description });

/** The audit trail's filters, shared by the JSON and CSV routes. */
const auditFilterParameters = [
  queryParameter(
    "site",
    { type: "string", format: "uuid" },
    "Entries about this site or its meters",
  ),
  queryParameter(
    "meter",
    { type: "string", format: "uuid" },
    "Entries about this meter",
  ),
  queryParameter(
    "person",
    { type: "string" },
    "Changes made by this person (user id)",
  ),
  queryParameter(
    "kind",
    { enum: [...auditKinds] },
    "correction, adjustment, month, meter, site, gateway, member, billing, baseline or report",
  ),
  queryParameter(
    "from",
    { type: "string", format: "date" },
    "First day, included",
  ),
  queryParameter(
    "to",
    { type: "string", format: "date" },
    "Last day, included",
  ),
  queryParameter(
    "tz",
    { type: "string" },
    "IANA time zone of from and to; UTC by default",
  ),
  queryParameter(
    "month",
    { type: "string", pattern: "^\\d{4}-\\d{2}$" },
    "The ledger month an entry concerns (adjusting entries, closes)",
  ),
  queryParameter(
    "carrier",
    { enum: ["heat", "cooling", "steam", "electricity"] },
    "Entries about meters of this carrier",
  ),
  queryParameter(
    "since",
    { type: "string", format: "date-time" },
    "Entries made at or after this instant",
  ),
];

/** The OpenAPI 3.1 description of /api/v1, served at /api/v1/openapi.json. */
export function openApiDocument() {
  return {
    openapi: "3.1.0",
    info: {
      title: "Joulebook API",
      version: "1.0.0",
      description:
        "Meter gateways and signed-in tools call this API. Evaluated energy and stored hours are signed by the IUPAC convention: what enters a site is positive (chilled water negative). The ledger shows delivered (imports_kwh >= 0) and exported (exports_kwh <= 0) energy per carrier, chilled water as cooling delivered, never added across carriers. Figures are for energy management; billing third parties needs meters approved under local legal-metrology rules.",
    },
    servers: [{ url: "/api/v1" }],
    security: [{ gatewayKey: [] }, { session: [] }],
    paths: {
      "/health": {
        get: {
          summary: "Liveness and database reachability",
          security: [],
          responses: {
            "200": {
              description: "Serving, database reachable",
              content: {
                "application/json": {
                  schema: { $ref: "#/components/schemas/Health" },
                },
              },
            },
            "503": {
              description: "Serving, database unreachable",
              content: {
                "application/json": {
                  schema: { $ref: "#/components/schemas/Health" },
                },
              },
            },
          },
        },
      },
      "/readings": {
        post: {
          summary: "A gateway's batch of readings",
          description:
            "Up to 5,000 readings or 5 MB. Idempotent on (meter, reading time): the same reading again is a repeat; a different one at the same key is a conflict, kept for review and not applied. A key only reaches its own organisation's meters. Acknowledged only after the batch is committed.",
          security: [{ gatewayKey: [] }],
          requestBody: {
            required: true,
            content: {
              "application/json": {
                schema: { $ref: "#/components/schemas/ReadingBatch" },
              },
            },
          },
          responses: {
            "200": {
              description:
                "What was stored, repeated, rejected (with index and reason) and in conflict",
              content: {
                "application/json": {
                  schema: { $ref: "#/components/schemas/IngestAnswer" },
                },
              },
            },
            "400": errorResponse("Not JSON, or not `{ readings: [...] }`"),
            "401": errorResponse(
              "No gateway key, or an unknown or revoked one",
            ),
            "413": errorResponse("More than 5,000 readings or 5 MB"),
            "429": errorResponse("This gateway's rate limit; see Retry-After"),
          },
        },
      },
      "/orgs/{orgId}/reports": {
        parameters: [orgIdParameter],
        get: {
          summary: "The organisation's signed reports, newest first",
          security: [{ session: [] }],
          responses: {
            "200": jsonResponse("`{ reports: [...] }` without the PDF bytes"),
            "401": errorResponse("Not signed in"),
            "404": errorResponse("Not a member of this organisation"),
          },
        },
        post: {
          summary: "Request a signed report (owners and energy managers)",
          description:
            'Made in the background: answered 202 with the report id; poll the list until its status is "done". `period` is `month:YYYY-MM`, `quarter:YYYY-Qn` or `year:YYYY`; `scope` is "all" or a site id.',
          security: [{ session: [] }],
          requestBody: {
            required: true,
            content: {
              "application/json": {
                schema: {
                  type: "object",
                  additionalProperties: false,
                  required: ["scope", "period"],
                  properties: {
                    scope: { type: "string", example: "all" },
                    period: { type: "string", example: "year:2025" },
                  },
                },
              },
            },
          },
          responses: {
            "202": jsonResponse('`{ id, status: "queued" }`'),
            "400": errorResponse("A bad scope or period"),
            "403": errorResponse("The role may not make reports"),
          },
        },
      },
      "/orgs/{orgId}/reports/{reportId}/pdf": {
        parameters: [
          orgIdParameter,
          {
            name: "reportId",
            in: "path",
            required: true,
            schema: { type: "string", format: "uuid" },
          },
        ],
        get: {
          summary: "The signed PDF, byte for byte as stored",
          description:
            "X-Content-SHA256 carries the SHA-256 that Verify matches against.",
          security: [{ session: [] }],
          responses: {
            "200": {
              description: "The PDF",
              content: {
                "application/pdf": {
                  schema: { type: "string", format: "binary" },
                },
              },
            },
            "404": errorResponse("No such report here, or not finished"),
          },
        },
      },
      "/orgs/{orgId}/reports/verify": {
        parameters: [orgIdParameter],
        post: {
          summary: "Check a PDF (owners and auditors)",
          description:
            'The verdict is "genuine" (signature valid, covering the whole file, and the SHA-256 of a report this organisation issued: which one, when, by whom), "not_issued_here" (validly signed but not one of this organisation\'s reports) or "invalid" with the reason (not_a_pdf, no_signature, malformed_signature, truncated, not_whole_document, digest_mismatch, bad_signature, untrusted_certificate) and a sentence saying why.',
          security: [{ session: [] }],
          requestBody: {
            required: true,
            content: {
              "application/pdf": {
                schema: { type: "string", format: "binary" },
              },
            },
          },
          responses: {
            "200": jsonResponse("The verdict"),
            "400": errorResponse("No body"),
            "403": errorResponse("The role may not verify"),
            "413": errorResponse("Larger than 25 MB"),
          },
        },
      },
      "/billing/webhook": {
        post: {
          summary: "Stripe's billing events (called by Stripe, not by people)",
          description:
            "Signed with the Stripe-Signature header over the raw body. Each event is applied once, keyed by its id, in the same transaction as its effect; a repeat answers 200 without changing anything. Events for customers Joulebook does not know are recorded and ignored. Answered only after the commit.",
          security: [],
          parameters: [
            {
              name: "Stripe-Signature",
              in: "header",
              required: true,
              schema: { type: "string" },
              description: "t=<unix time>,v1=<HMAC-SHA256 of t.body>",
            },
          ],
          requestBody: {
            required: true,
            content: {
              "application/json": {
                schema: {
                  type: "object",
                  required: ["id", "type", "data"],
                  properties: {
                    id: { type: "string" },
                    type: { type: "string" },
                    data: { type: "object" },
                  },
                },
              },
            },
          },
          responses: {
            "200": {
              description: "Recorded: applied, a repeat, or ignored",
              content: {
                "application/json": {
                  schema: {
                    type: "object",
                    required: ["received", "id", "outcome"],
                    properties: {
                      received: { const: true },
                      id: { type: "string" },
                      outcome: {
                        enum: ["applied", "duplicate", "ignored"],
                      },
                    },
                  },
                },
              },
            },
            "400": errorResponse(
              "Missing or wrong signature (`invalid_signature`); nothing changed",
            ),
          },
        },
      },
      "/orgs/{orgId}/readings": {
        post: {
          summary:
            "Upload readings as a signed-in energy manager (the CSV page sends these)",
          security: [{ session: [] }],
          parameters: [
            {
              name: "orgId",
              in: "path",
              required: true,
              schema: { type: "string", format: "uuid" },
            },
          ],
          requestBody: {
            required: true,
            content: {
              "application/json": {
                schema: { $ref: "#/components/schemas/ReadingBatch" },
              },
            },
          },
          responses: {
            "200": {
              description: "As for /readings",
              content: {
                "application/json": {
                  schema: { $ref: "#/components/schemas/IngestAnswer" },
                },
              },
            },
            "403": errorResponse("The role may not edit readings"),
            "404": errorResponse("Not a member of this organisation"),
          },
        },
      },
      "/orgs/{orgId}/meters/{meterId}/intervals": {
        get: {
          summary: "A meter's hourly intervals (signed kWh, quality, flags)",
          security: [{ session: [] }],
          parameters: [
            {
              name: "orgId",
              in: "path",
              required: true,
              schema: { type: "string", format: "uuid" },
            },
            {
              name: "meterId",
              in: "path",
              required: true,
              schema: { type: "string", format: "uuid" },
            },
            {
              name: "from",
              in: "query",
              schema: { type: "string", format: "date-time" },
            },
            {
              name: "to",
              in: "query",
              schema: { type: "string", format: "date-time" },
              description:
                "At most 93 days after from; default: the newest week",
            },
          ],
          responses: {
            "200": { description: "The meter and its intervals, oldest first" },
            "404": errorResponse(
              "No such meter in an organisation you belong to",
            ),
          },
        },
      },
      "/orgs/{orgId}/audit": {
        parameters: [orgIdParameter],
        get: {
          summary:
            "The audit trail: every change, newest first (owners and auditors)",
          description:
            "Corrections, adjusting entries, month close and reopen, meters and swaps, sites, gateway keys, members and roles, billing state, baselines and weather, reports. Each entry has who (`actor`: a person, a gateway, or Stripe/Joulebook), when (`occurred_at`), why (`reason`), the values `before` and `after` as stored, and `changes`: the same as readable lines. 200 entries a page; pass `next_before` back as `before` for older ones.",
          security: [{ session: [] }],
          parameters: [
            ...auditFilterParameters,
            {
              name: "limit",
              in: "query",
              schema: { type: "integer", minimum: 1, maximum: 500 },
              description: "Entries per page; 200 by default",
            },
            {
              name: "before",
              in: "query",
              schema: { type: "integer" },
              description: "The previous page's `next_before`",
            },
          ],
          responses: {
            "200": jsonResponse(
              "`{ entries: [{ id, occurred_at, action, action_label, kind, kind_label, actor: { type, id, name }, site, meter, subject, reason, changes: [{ field, before, after }], before, after, details }], next_before }`",
            ),
            "400": errorResponse("A filter that is not valid"),
            "403": errorResponse("The role may not read the audit trail"),
            "404": errorResponse("No such organisation of yours"),
          },
        },
      },
      "/orgs/{orgId}/audit.csv": {
        parameters: [orgIdParameter],
        get: {
          summary: "The audit trail as CSV, with the same filters",
          description:
            "Columns: occurred_at_utc, kind, change, who, site, meter, subject, reason, before, after, entry_id. Cells a spreadsheet would run as formulas are written as text. At most 50,000 entries (`400 too_many_entries` beyond).",
          security: [{ session: [] }],
          parameters: auditFilterParameters,
          responses: {
            "200": {
              description: "The CSV file",
              content: { "text/csv": { schema: { type: "string" } } },
            },
            "400": errorResponse(
              "A filter that is not valid, or too many entries",
            ),
            "403": errorResponse("The role may not read the audit trail"),
          },
        },
      },
      "/energy/evaluate": {
        post: {
          summary: "Turn measured quantities into energy (nothing is stored)",
          description:
            "Up to 10,000 items. Results come back in item order; an item that fails answers `ok: false` with a plain reason and never fails the others.",
          requestBody: {
            required: true,
            content: {
              "application/json": {
                schema: { $ref: "#/components/schemas/EvaluateRequest" },
              },
            },
          },
          responses: {
            "200": {
              description: "One result per item, in order",
              content: {
                "application/json": {
                  schema: { $ref: "#/components/schemas/EvaluateResponse" },
                },
              },
            },
            "400": errorResponse(
              "The body is not JSON or not an object with 1–10,000 items",
            ),
            "401": errorResponse("No valid gateway key or session"),
            "413": errorResponse("Body larger than 8 MB"),
          },
        },
      },
    },
    components: {
      securitySchemes: {
        gatewayKey: {
          type: "http",
          scheme: "bearer",
          description:
            "A gateway's API key, shown once when the gateway is created.",
        },
        session: { type: "apiKey", in: "cookie", name: "jb_session" },
      },
      schemas: {
        Error: errorSchema,
        Health: {
          type: "object",
          required: ["status", "database", "time"],
          properties: {
            status: { enum: ["ok", "degraded"] },
            database: { enum: ["reachable", "unreachable"] },
            time: { type: "string", format: "date-time" },
          },
        },
        ReadingBatch: {
          type: "object",
          required: ["readings"],
          additionalProperties: false,
          properties: {
            readings: {
              type: "array",
              minItems: 1,
              maxItems: 5000,
              items: {
                type: "object",
                required: ["meter", "quantity"],
                description:
                  "An evaluate item (see EvaluateItem) plus `meter`; interval quantities need `start` and `end`. Registers: `{ meter, quantity: electric_register | heat_register, time, register_kwh }`.",
                properties: {
                  meter: { type: "string", maxLength: 64 },
                  quantity: {
                    enum: [
                      "water_heat",
                      "steam_heat",
                      "sensible_heat",
                      "electric_work",
                      "electric_register",
                      "heat_register",
                    ],
                  },
                  start: { type: "string", format: "date-time" },
                  end: { type: "string", format: "date-time" },
                  time: { type: "string", format: "date-time" },
                  register_kwh: { type: "number", minimum: 0 },
                },
              },
            },
          },
        },
        IngestAnswer: {
          type: "object",
          required: [
            "batch_id",
            "accepted",
            "repeats",
            "rejected",
            "conflicts",
          ],
          properties: {
            batch_id: { type: "string", format: "uuid" },
            accepted: { type: "integer" },
            repeats: { type: "integer" },
            rejected: {
              type: "array",
              items: { $ref: "#/components/schemas/ItemProblem" },
            },
            conflicts: {
              type: "array",
              items: { $ref: "#/components/schemas/ItemProblem" },
            },
          },
        },
        ItemProblem: {
          type: "object",
          required: ["index", "reason"],
          properties: {
            index: { type: "integer" },
            meter: { type: "string" },
            reason: { type: "string" },
          },
        },
        ...evaluateOpenApi.components.schemas,
      },
    },
  };
}
