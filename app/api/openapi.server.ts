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

/** The OpenAPI 3.1 description of /api/v1, served at /api/v1/openapi.json. */
export function openApiDocument() {
  return {
    openapi: "3.1.0",
    info: {
      title: "Joulebook API",
      version: "1.0.0",
      description:
        "Meter gateways and signed-in tools call this API. Energy is signed by the IUPAC convention: what enters a site is positive. Figures are for energy management; billing third parties needs meters approved under local legal-metrology rules.",
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
        ...evaluateOpenApi.components.schemas,
      },
    },
  };
}
