/**
 * The API contract: /api/v1/openapi.json names every route the Express
 * router serves, is a valid OpenAPI 3.1 document, the examples in it and in
 * docs/api.md fit its schemas, and what the running server answers fits them
 * too (status by status, validated with a JSON Schema 2020-12 validator).
 */
import { readFile } from "node:fs/promises";
import { Validator } from "@seriousme/openapi-schema-validator";
import { Ajv2020 } from "ajv/dist/2020.js";
import addFormats from "ajv-formats";
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

applyAppTestEnv();
// After the environment is set: the app's modules read it when they load.
const { apiRouter } = await import("../../app/api/router.server");
const { EVALUATE_QUANTITIES, evaluateItemSchema } =
  await import("../../app/physics/evaluate-schema");

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

type Json = Record<string, unknown>;
interface OpenApiDocument {
  openapi: string;
  paths: Record<string, PathItem>;
  components: { schemas: Record<string, Json> };
}
type PathItem = Partial<Record<(typeof METHODS)[number], Operation>> & {
  parameters?: Operation["parameters"];
};
interface Operation {
  parameters?: { name: string; in: string }[];
  requestBody?: {
    content: Record<string, { schema: Json; example?: unknown }>;
  };
  responses: Record<string, { content?: Record<string, { schema?: Json }> }>;
}

const METHODS = ["get", "post", "put", "patch", "delete"] as const;

/** Express's `/orgs/:orgId` written as OpenAPI's `/orgs/{orgId}`. */
const openApiPath = (expressPath: string) =>
  expressPath.replace(/:(\w+)/g, "{$1}");

/** Every method and path the router answers, from its stack. */
function routerRoutes(): string[] {
  const stack = (
    apiRouter() as unknown as {
      stack: { route?: { path: string; methods: Record<string, boolean> } }[];
    }
  ).stack;
  return stack.flatMap((layer) =>
    layer.route
      ? Object.keys(layer.route.methods)
          .filter((method) => layer.route!.methods[method])
          .map((method) => `${method.toUpperCase()} ${layer.route!.path}`)
      : [],
  );
}

function documentRoutes(doc: OpenApiDocument): string[] {
  return Object.entries(doc.paths).flatMap(([path, item]) =>
    METHODS.filter((m) => item[m]).map((m) => `${m.toUpperCase()} ${path}`),
  );
}

function refsIn(value: unknown, out: string[] = []): string[] {
  if (Array.isArray(value)) {
    for (const v of value) refsIn(v, out);
  } else if (value !== null && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (k === "$ref" && typeof v === "string") out.push(v);
      else refsIn(v, out);
    }
  }
  return out;
}

/** A JSON pointer (`#/components/schemas/X`) looked up in the document. */
function resolve(doc: unknown, ref: string): unknown {
  return ref
    .replace(/^#\//, "")
    .split("/")
    .map((part) => part.replace(/~1/g, "/").replace(/~0/g, "~"))
    .reduce<unknown>(
      (node, key) =>
        node && typeof node === "object"
          ? (node as Record<string, unknown>)[key]
          : undefined,
      doc,
    );
}

const DOC_ID = "https://joulebook.test/api/v1/openapi.json";
let doc: OpenApiDocument;
let ajv: Ajv2020;

beforeAll(async () => {
  doc = (await (
    await new Client().get("/api/v1/openapi.json")
  ).json()) as OpenApiDocument;
  ajv = new Ajv2020({ strict: false, allErrors: true });
  addFormats.default(ajv);
  ajv.addFormat("binary", true);
  // The whole document as one schema: its `#/components/…` refs resolve in it.
  ajv.addSchema({ ...doc, $id: DOC_ID });
});

const pointer = (...parts: string[]) =>
  parts.map((p) => p.replace(/~/g, "~0").replace(/\//g, "~1")).join("/");

/** Checks `value` against a schema of the document found by JSON pointer. */
function check(path: string[], value: unknown): string[] {
  const validate = ajv.getSchema(`${DOC_ID}#/${pointer(...path)}`);
  if (!validate) throw new Error(`no schema at ${path.join(" > ")}`);
  if (validate(value)) return [];
  return (validate.errors ?? []).map(
    (e) => `${e.instancePath || "(root)"} ${e.message}`,
  );
}

/** The problems of an answer against the document's schema for its status. */
async function answerProblems(
  method: "get" | "post" | "patch" | "delete",
  expressPath: string,
  response: Response,
): Promise<string[]> {
  const path = openApiPath(expressPath);
  const status = String(response.status);
  const operation = doc.paths[path]?.[method];
  if (!operation) return [`${method} ${path} is not in the document`];
  const described = operation.responses[status];
  if (!described) return [`${method} ${path} does not list ${status}`];
  const mediaType = (response.headers.get("content-type") ?? "").split(";")[0];
  if (!described.content?.[mediaType])
    return [`${method} ${path} ${status} does not list ${mediaType}`];
  if (mediaType !== "application/json") return [];
  return check(
    [
      "paths",
      path,
      method,
      "responses",
      status,
      "content",
      mediaType,
      "schema",
    ],
    await response.json(),
  );
}

describe("the document names every route of the router", () => {
  it("every method and path the router serves is in /api/v1/openapi.json, and nothing else", () => {
    const served = routerRoutes().map((route) => {
      const [method, path] = route.split(" ");
      return `${method} ${openApiPath(path)}`;
    });
    expect(served.length).toBeGreaterThanOrEqual(13);
    expect(documentRoutes(doc).sort()).toEqual([...served].sort());
  });

  it("each operation declares exactly the path parameters its path has", () => {
    for (const [path, item] of Object.entries(doc.paths)) {
      const placeholders = [...path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
      for (const method of METHODS) {
        const operation = item[method];
        if (!operation) continue;
        // Parameters may sit on the path item (shared) or on the operation.
        const declared = [
          ...(item.parameters ?? []),
          ...(operation.parameters ?? []),
        ]
          .filter((p) => p.in === "path")
          .map((p) => p.name);
        expect(declared.sort(), `${method} ${path}`).toEqual(
          placeholders.sort(),
        );
      }
    }
  });
});

describe("the document is valid OpenAPI 3.1", () => {
  it("passes the OpenAPI 3.1 schema", async () => {
    const result = await new Validator().validate(
      doc as unknown as Record<string, unknown>,
    );
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect(doc.openapi).toBe("3.1.0");
  });

  it("resolves every $ref, and every component's schema compiles", () => {
    const refs = refsIn(doc);
    expect(refs.length).toBeGreaterThan(20);
    for (const ref of new Set(refs)) {
      expect(resolve(doc, ref), ref).toBeDefined();
    }
    for (const name of Object.keys(doc.components.schemas)) {
      expect(
        ajv.getSchema(`${DOC_ID}#/components/schemas/${name}`),
        name,
      ).toBeDefined();
    }
  });

  it("organisation routes take an API token or a session; gateway routes a gateway key", () => {
    const raw = doc as unknown as {
      components: { securitySchemes: Record<string, { scheme?: string }> };
      paths: Record<string, Record<string, { security?: unknown }>>;
    };
    expect(raw.components.securitySchemes.apiToken).toMatchObject({
      type: "http",
      scheme: "bearer",
    });
    expect(raw.paths["/orgs/{orgId}/sites"].post.security).toEqual([
      { apiToken: [] },
      { session: [] },
    ]);
    expect(raw.paths["/readings"].post.security).toEqual([{ gatewayKey: [] }]);
  });

  it("carries no $schema or $id inside the components", () => {
    for (const component of Object.values(doc.components.schemas)) {
      expect(component).not.toHaveProperty("$schema");
      expect(component).not.toHaveProperty("$id");
    }
  });

  it("picks the evaluate item by quantity, and items are strict", () => {
    const item = doc.components.schemas.EvaluateItem as {
      discriminator: { propertyName: string; mapping: Record<string, string> };
    };
    expect(item.discriminator.propertyName).toBe("quantity");
    expect(Object.keys(item.discriminator.mapping).sort()).toEqual(
      [...EVALUATE_QUANTITIES].sort(),
    );
    const water = doc.components.schemas.WaterHeatItem as {
      additionalProperties: unknown;
      required: string[];
    };
    expect(water.additionalProperties).toBe(false);
    expect(water.required).toEqual(
      expect.arrayContaining([
        "quantity",
        "volume_m3",
        "flow_temp_c",
        "return_temp_c",
      ]),
    );
  });

  it("offers a reading of every quantity a meter measures, fuels included", () => {
    type Variant = {
      properties: { quantity: { const?: string; enum?: string[] } };
    };
    const reading = doc.components.schemas.Reading as { oneOf: Variant[] };
    const offered = reading.oneOf.flatMap(
      (v) => v.properties.quantity.enum ?? [v.properties.quantity.const!],
    );
    expect(offered).toEqual(
      expect.arrayContaining(["gas_volume", "liquid_fuel", "hydrogen"]),
    );
  });
});

describe("examples fit the schemas", () => {
  it("every request example in the document fits its request schema", () => {
    let examples = 0;
    for (const [path, item] of Object.entries(doc.paths)) {
      for (const method of METHODS) {
        const content = item[method]?.requestBody?.content ?? {};
        for (const [mediaType, media] of Object.entries(content)) {
          if (media.example === undefined) continue;
          examples++;
          const at = ["paths", path, method, "requestBody", "content"];
          expect(
            check([...at, mediaType, "schema"], media.example),
            `${method} ${path}`,
          ).toEqual([]);
        }
      }
    }
    expect(examples).toBeGreaterThanOrEqual(4);
  });

  it("docs/api.md's evaluate example: the envelope, each item, the answer and the error body", async () => {
    const markdown = await readFile("docs/api.md", "utf8");
    const request = JSON.parse(
      /<<'JSON'\n([\s\S]*?)\nJSON\n/.exec(markdown)![1],
    ) as { items: unknown[] };
    const answer = JSON.parse(
      /The answer, as the server gave it \(`200`\):\n\n```json\n([\s\S]*?)\n```/.exec(
        markdown,
      )![1],
    );
    const errorBody = JSON.parse(
      /## Errors[\s\S]*?```json\n([\s\S]*?)\n```/.exec(markdown)![1],
    );
    const item = ["components", "schemas", "EvaluateItem"];
    const verdicts = request.items.map((it) => ({
      document: check(item, it).length === 0,
      zod: evaluateItemSchema.safeParse(it).success,
    }));
    // The last item sends its volume as a string, on purpose; the rest are
    // well formed (the second-last fails only the phase rule, not the shape).
    expect(verdicts).toEqual([
      ...Array(request.items.length - 1).fill({ document: true, zod: true }),
      { document: false, zod: false },
    ]);
    expect(
      check(["components", "schemas", "EvaluateRequest"], {
        items: request.items.slice(0, -1),
      }),
    ).toEqual([]);
    expect(
      check(["components", "schemas", "EvaluateResponse"], answer),
    ).toEqual([]);
    expect(check(["components", "schemas", "Error"], errorBody)).toEqual([]);
  });
});

describe("what the server answers fits the document", () => {
  const ROLES = ["owner", "energy_manager", "finance", "auditor"] as const;
  let org: MeteredOrg;
  let owner: Client;
  let finance: Client;
  let orgPath: string;

  beforeAll(async () => {
    org = await createMeteredOrg({ roles: [...ROLES] });
    orgPath = `/orgs/${org.org.id}`;
    owner = new Client();
    await owner.signIn(org.org.members[0].email, org.org.members[0].password);
    finance = new Client();
    await finance.signIn(org.org.members[2].email, org.org.members[2].password);
  });

  const api = (path: string) => `/api/v1${path}`;
  const gateway = () => ({ authorization: `Bearer ${org.gatewayKey}` });

  async function expectFits(
    method: "get" | "post" | "patch" | "delete",
    expressPath: string,
    response: Response,
    status: number,
  ) {
    expect(response.status, `${method} ${expressPath}`).toBe(status);
    expect(
      await answerProblems(method, expressPath, response),
      `${method} ${expressPath} ${status}`,
    ).toEqual([]);
  }

  it("health, the document itself, and an unknown route", async () => {
    await expectFits("get", "/health", await owner.get(api("/health")), 200);
    await expectFits(
      "get",
      "/openapi.json",
      await owner.get(api("/openapi.json")),
      200,
    );
    const unknown = await owner.get(api("/no/such/route"));
    expect(unknown.status).toBe(404);
    expect(
      check(["components", "schemas", "Error"], await unknown.json()),
    ).toEqual([]);
  });

  it("readings from a gateway and from a signed-in manager, then the intervals", async () => {
    const t0 = Date.parse("2026-03-10T00:00:00Z");
    const readings = Array.from({ length: 25 }, (_, i) => ({
      meter: org.meters.register.code,
      quantity: "electric_register",
      time: new Date(t0 + i * 3_600_000).toISOString(),
      register_kwh: 5000 + i * 12.5,
    }));
    await expectFits(
      "post",
      "/readings",
      await new Client().postJson(
        api("/readings"),
        { readings: [...readings, { meter: "nope", quantity: "x" }] },
        gateway(),
      ),
      200,
    );
    await expectFits(
      "post",
      "/readings",
      await new Client().postJson(
        api("/readings"),
        { readings: [] },
        gateway(),
      ),
      400,
    );
    await expectFits(
      "post",
      "/readings",
      await new Client().postJson(api("/readings"), { readings }),
      401,
    );
    await expectFits(
      "post",
      "/orgs/:orgId/readings",
      await owner.postJson(api(`${orgPath}/readings`), {
        readings: readings.slice(0, 2),
      }),
      200,
    );
    await expectFits(
      "post",
      "/orgs/:orgId/readings",
      await finance.postJson(api(`${orgPath}/readings`), { readings }),
      403,
    );
    const intervals = "/orgs/:orgId/meters/:meterId/intervals";
    const meterPath = `${orgPath}/meters/${org.meters.register.id}/intervals`;
    await expectFits("get", intervals, await owner.get(api(meterPath)), 200);
    await expectFits(
      "get",
      intervals,
      await owner.get(
        api(`${meterPath}?from=2026-03-10T00:00:00Z&to=2026-03-11T00:00:00Z`),
      ),
      200,
    );
    await expectFits(
      "get",
      intervals,
      await owner.get(api(`${meterPath}?from=yesterday`)),
      400,
    );
    await expectFits(
      "get",
      intervals,
      await owner.get(
        api(`${orgPath}/meters/00000000-0000-4000-8000-000000000000/intervals`),
      ),
      404,
    );
  });

  it("evaluate, with a good and a bad item, and a bad envelope", async () => {
    await expectFits(
      "post",
      "/energy/evaluate",
      await new Client().postJson(
        api("/energy/evaluate"),
        {
          items: [
            {
              quantity: "electric_work",
              circuit: "dc",
              volts: 100,
              amps: 10,
              seconds: 3600,
            },
            { quantity: "water_heat", volume_m3: "1" },
          ],
        },
        gateway(),
      ),
      200,
    );
    await expectFits(
      "post",
      "/energy/evaluate",
      await owner.postJson(api("/energy/evaluate"), "{not json"),
      400,
    );
  });

  it("the ledger as JSON, CSV and XLSX, and a bad range", async () => {
    const query = "?from=2026-01&to=2026-12";
    for (const path of ["ledger", "ledger.csv", "ledger.xlsx"]) {
      await expectFits(
        "get",
        `/orgs/:orgId/${path}`,
        await owner.get(api(`${orgPath}/${path}${query}`)),
        200,
      );
      await expectFits(
        "get",
        `/orgs/:orgId/${path}`,
        await owner.get(api(`${orgPath}/${path}?from=2026-13&to=2026-01`)),
        400,
      );
    }
    await expectFits(
      "get",
      "/orgs/:orgId/ledger",
      await new Client().get(api(`${orgPath}/ledger${query}`)),
      401,
    );
    await expectFits(
      "get",
      "/orgs/:orgId/ledger",
      await owner.get(
        api(`/orgs/00000000-0000-4000-8000-000000000000/ledger${query}`),
      ),
      404,
    );
  });

  it("reports: request one, list, download and verify it", async () => {
    const reports = "/orgs/:orgId/reports";
    await expectFits(
      "post",
      reports,
      await finance.postJson(api(`${orgPath}/reports`), {
        scope: "all",
        period: "month:2026-03",
      }),
      403,
    );
    await expectFits(
      "post",
      reports,
      await owner.postJson(api(`${orgPath}/reports`), {
        scope: "all",
        period: "fortnight:2026-03",
      }),
      400,
    );
    const queued = await owner.postJson(api(`${orgPath}/reports`), {
      scope: "all",
      period: "month:2026-03",
    });
    const { id } = (await queued.clone().json()) as { id: string };
    await expectFits("post", reports, queued, 202);

    const deadline = Date.now() + 60_000;
    let status = "queued";
    while (status !== "done" && Date.now() < deadline) {
      const list = await owner.get(api(`${orgPath}/reports`));
      const body = (await list.clone().json()) as {
        reports: { id: string; status: string }[];
      };
      status = body.reports.find((r) => r.id === id)?.status ?? "missing";
      await expectFits("get", reports, list, 200);
      if (status === "failed") throw new Error("the report failed");
      if (status !== "done") await new Promise((r) => setTimeout(r, 250));
    }
    expect(status).toBe("done");

    const pdfPath = "/orgs/:orgId/reports/:reportId/pdf";
    const pdf = await owner.get(api(`${orgPath}/reports/${id}/pdf`));
    const bytes = Buffer.from(await pdf.clone().arrayBuffer());
    await expectFits("get", pdfPath, pdf, 200);
    await expectFits(
      "get",
      pdfPath,
      await owner.get(api(`${orgPath}/reports/not-an-id/pdf`)),
      404,
    );

    const verifyPath = "/orgs/:orgId/reports/verify";
    const verify = (body: Buffer) =>
      owner.request(api(`${orgPath}/reports/verify`), {
        method: "POST",
        headers: { "content-type": "application/pdf" },
        body: new Uint8Array(body),
      });
    const genuine = await verify(bytes);
    expect(await genuine.clone().json()).toMatchObject({ verdict: "genuine" });
    await expectFits("post", verifyPath, genuine, 200);
    const invalid = await verify(Buffer.from("%PDF-1.7 nothing signed"));
    expect(await invalid.clone().json()).toMatchObject({ verdict: "invalid" });
    await expectFits("post", verifyPath, invalid, 200);
    await expectFits("post", verifyPath, await verify(Buffer.alloc(0)), 400);
  });

  it("sites and meters: create, read, list, patch, archive, and the refusals", async () => {
    const sites = "/orgs/:orgId/sites";
    const site = "/orgs/:orgId/sites/:siteId";
    const meters = "/orgs/:orgId/meters";
    const meter = "/orgs/:orgId/meters/:meterId";
    const patch = (path: string, body: unknown) =>
      owner.request(api(path), {
        method: "PATCH",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(body),
      });
    const siteBody = { name: `Contract ${org.tag}`, time_zone: "UTC" };
    const created = await owner.postJson(api(`${orgPath}/sites`), siteBody);
    const siteId = ((await created.clone().json()) as { id: string }).id;
    await expectFits("post", sites, created, 201);
    await expectFits(
      "post",
      sites,
      await owner.postJson(api(`${orgPath}/sites`), siteBody),
      409,
    );
    await expectFits(
      "post",
      sites,
      await finance.postJson(api(`${orgPath}/sites`), siteBody),
      403,
    );
    await expectFits(
      "get",
      sites,
      await owner.get(api(`${orgPath}/sites`)),
      200,
    );
    const sitePath = `${orgPath}/sites/${siteId}`;
    await expectFits("get", site, await finance.get(api(sitePath)), 200);
    await expectFits(
      "patch",
      site,
      await patch(sitePath, { address: "1 Quay" }),
      200,
    );
    await expectFits(
      "patch",
      site,
      await patch(sitePath, { time_zone: "Nope" }),
      400,
    );
    const meterBody = {
      site_id: siteId,
      code: `C-${org.tag}`,
      name: "Contract meter",
      quantity: "electric_register",
      carrier: "electricity",
      orientation: "import",
      installed_at: "2026-01-01",
    };
    const newMeter = await owner.postJson(api(`${orgPath}/meters`), meterBody);
    const meterId = ((await newMeter.clone().json()) as { id: string }).id;
    await expectFits("post", meters, newMeter, 201);
    await expectFits(
      "post",
      meters,
      await owner.postJson(api(`${orgPath}/meters`), {
        ...meterBody,
        interval_minutes: 20,
      }),
      400,
    );
    await expectFits(
      "get",
      meters,
      await owner.get(api(`${orgPath}/meters`)),
      200,
    );
    const meterPath = `${orgPath}/meters/${meterId}`;
    await expectFits("get", meter, await owner.get(api(meterPath)), 200);
    await expectFits(
      "patch",
      meter,
      await patch(meterPath, { serial: "SN-1" }),
      200,
    );
    await expectFits(
      "post",
      `${meter}/archive`,
      await owner.postJson(api(`${meterPath}/archive`), {}),
      200,
    );
    await expectFits(
      "post",
      `${meter}/archive`,
      await owner.postJson(api(`${meterPath}/archive`), {}),
      409,
    );
    await expectFits(
      "post",
      `${site}/archive`,
      await owner.postJson(api(`${sitePath}/archive`), {}),
      200,
    );
    await expectFits(
      "get",
      site,
      await owner.get(
        api(`${orgPath}/sites/00000000-0000-4000-8000-000000000000`),
      ),
      404,
    );
  });

  it("a gas supply: its settings and calorific values, entered, listed, refused and removed", async () => {
    const created = await owner.postJson(api(`${orgPath}/meters`), {
      site_id: org.siteId,
      code: `GC-${org.tag}`,
      name: "Contract gas supply",
      quantity: "gas_volume",
      carrier: "natural_gas",
      orientation: "import",
      installed_at: "2026-01-01",
    });
    const meterId = ((await created.json()) as { id: string }).id;
    const settings = "/orgs/:orgId/meters/:meterId/gas-settings";
    const cvs = "/orgs/:orgId/meters/:meterId/calorific-values";
    const meterPath = `${orgPath}/meters/${meterId}`;
    await expectFits(
      "post",
      settings,
      await owner.postJson(api(`${meterPath}/gas-settings`), {
        register_unit: "hcf",
        correction_factor: 1.02264,
      }),
      200,
    );
    await expectFits(
      "get",
      settings,
      await finance.get(api(`${meterPath}/gas-settings`)),
      200,
    );
    await expectFits(
      "post",
      cvs,
      await owner.postJson(api(`${meterPath}/calorific-values`), {
        entries: [
          { period: "2026-01", calorific_value_mj_m3: 39.3 },
          { period: "2026-01-05", calorific_value_mj_m3: 39.1, basis: "net" },
        ],
      }),
      201,
    );
    await expectFits(
      "post",
      cvs,
      await owner.postJson(api(`${meterPath}/calorific-values`), {
        period: "2026-02",
        calorific_value_mj_m3: 65,
      }),
      400,
    );
    await expectFits(
      "get",
      cvs,
      await finance.get(api(`${meterPath}/calorific-values`)),
      200,
    );
    const removed = await owner.request(
      api(`${meterPath}/calorific-values/2026-01-05`),
      { method: "DELETE" },
    );
    expect(removed.status).toBe(204);
    await expectFits(
      "delete",
      `${cvs}/:period`,
      await owner.request(api(`${meterPath}/calorific-values/2026-01-05`), {
        method: "DELETE",
      }),
      404,
    );
  });

  it("the billing webhook, signed and unsigned", async () => {
    const stripe = new Stripe("sk_test_joulebook");
    const payload = JSON.stringify({
      id: `evt_contract_${org.tag}`,
      object: "event",
      type: "customer.subscription.updated",
      data: { object: { id: "sub_x", customer: "cus_nobody_here" } },
    });
    const signed = await new Client().postJson(
      api("/billing/webhook"),
      payload,
      {
        "stripe-signature": stripe.webhooks.generateTestHeaderString({
          payload,
          secret: "whsec_test_joulebook_fake",
        }),
      },
    );
    await expectFits("post", "/billing/webhook", signed, 200);
    await expectFits(
      "post",
      "/billing/webhook",
      await new Client().postJson(api("/billing/webhook"), payload),
      400,
    );
  });
});
