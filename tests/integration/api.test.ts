import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { hashToken } from "../../app/auth/tokens.server";
import { Client } from "../support/http";
import { db, organizationId, pool, schema } from "../support/db";

afterAll(() => pool.end());

const DEMO_KEY =
  process.env.DEMO_GATEWAY_KEY || "jbgw_demo_larchmere_development_only_key";
const bearer = (key: string) => ({ authorization: `Bearer ${key}` });

// 1 m³ of heating water, 80 °C flow, 60 °C return, 16 bar a, sensor in the return.
const waterItem = {
  quantity: "water_heat",
  volume_m3: 1,
  flow_temp_c: 80,
  return_temp_c: 60,
  pressure_bar_abs: 16,
  sensor_at: "return",
};

describe("GET /api/v1/health", () => {
  it("reports the database as reachable and the one serving process", async () => {
    const response = await new Client().get("/api/v1/health");
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      status: "ok",
      database: "reachable",
      processes: 1,
    });
  });
});

describe("GET /api/v1/openapi.json", () => {
  it("is an OpenAPI 3.1 document describing the routes", async () => {
    const doc = (await (
      await new Client().get("/api/v1/openapi.json")
    ).json()) as {
      openapi: string;
      paths: Record<string, unknown>;
      components: { schemas: Record<string, unknown> };
    };
    expect(doc.openapi).toBe("3.1.0");
    expect(Object.keys(doc.paths)).toEqual(
      expect.arrayContaining([
        "/health",
        "/energy/evaluate",
        "/readings",
        "/orgs/{orgId}/meters/{meterId}/intervals",
      ]),
    );
    expect(doc.components.schemas).toHaveProperty("EvaluateRequest");
    expect(doc.components.schemas).toHaveProperty("WaterHeatItem");
  });
});

describe("POST /api/v1/energy/evaluate", () => {
  it("the demo gateway key evaluates items in order, one bad item failing alone", async () => {
    const response = await new Client().postJson(
      "/api/v1/energy/evaluate",
      {
        items: [
          waterItem,
          { ...waterItem, volume_m3: "1" },
          {
            quantity: "electric_work",
            circuit: "dc",
            volts: 100,
            amps: 10,
            seconds: 3600,
          },
        ],
      },
      bearer(DEMO_KEY),
    );
    expect(response.status).toBe(200);
    const { results } = (await response.json()) as {
      results: { ok: boolean; energy_kwh?: number; error?: string }[];
    };
    expect(results).toHaveLength(3);
    expect(results[0].ok).toBe(true);
    // Positive and plausible: about 20 K × 4.19 kJ/(kg·K) × ~983 kg ≈ 22.9 kWh (common practice).
    expect(results[0].energy_kwh).toBeGreaterThan(22);
    expect(results[0].energy_kwh).toBeLessThan(24);
    expect(results[1].ok).toBe(false);
    expect(results[1].error).toContain("volume_m3");
    // DC: 100 V × 10 A × 1 h = 1 kWh exactly.
    expect(results[2]).toMatchObject({ ok: true, energy_kwh: 1 });
  });

  it("marks the gateway as seen", async () => {
    const larchmere = await organizationId("Larchmere Borough Estates");
    const [gateway] = await db
      .select()
      .from(schema.gateways)
      .where(eq(schema.gateways.organizationId, larchmere));
    expect(gateway.lastSeenAt).not.toBeNull();
  });

  it("a signed-in session may evaluate too", async () => {
    const client = new Client();
    await client.signIn("auditor@larchmere.example");
    const response = await client.postJson("/api/v1/energy/evaluate", {
      items: [waterItem],
    });
    expect(response.status).toBe(200);
  });

  it("no key, an unknown key and a revoked key answer 401", async () => {
    const client = new Client();
    expect(
      (await client.postJson("/api/v1/energy/evaluate", { items: [waterItem] }))
        .status,
    ).toBe(401);
    expect(
      (
        await client.postJson(
          "/api/v1/energy/evaluate",
          { items: [waterItem] },
          bearer("jbgw_unknown"),
        )
      ).status,
    ).toBe(401);
    const key = `jbgw_${randomUUID()}`;
    await db.insert(schema.gateways).values({
      organizationId: await organizationId("Hollowmead Housing Co-operative"),
      name: "Revoked test gateway",
      keyHash: hashToken(key),
      keyPrefix: key.slice(0, 12),
      revokedAt: new Date(),
    });
    const revoked = await client.postJson(
      "/api/v1/energy/evaluate",
      { items: [waterItem] },
      bearer(key),
    );
    expect(revoked.status).toBe(401);
    expect(await revoked.json()).toMatchObject({
      error: { code: "invalid_key" },
    });
  });

  it("malformed JSON, a wrong envelope, too many items and an oversized body are refused with a JSON error", async () => {
    const client = new Client();
    const malformed = await client.postJson(
      "/api/v1/energy/evaluate",
      '{"items": [',
      bearer(DEMO_KEY),
    );
    expect(malformed.status).toBe(400);
    expect(await malformed.json()).toMatchObject({
      error: { code: "invalid_json" },
    });

    const envelope = await client.postJson(
      "/api/v1/energy/evaluate",
      { items: [], extra: 1 },
      bearer(DEMO_KEY),
    );
    expect(envelope.status).toBe(400);
    const body = (await envelope.json()) as {
      error: { issues: { path: string }[] };
    };
    expect(body.error.issues.map((i) => i.path)).toEqual(
      expect.arrayContaining(["items"]),
    );

    const tooMany = await client.postJson(
      "/api/v1/energy/evaluate",
      { items: Array(10_001).fill(waterItem) },
      bearer(DEMO_KEY),
    );
    expect(tooMany.status).toBe(400);

    const huge = await client.postJson(
      "/api/v1/energy/evaluate",
      { items: [{ ...waterItem, pad: "x".repeat(9_000_000) }] },
      bearer(DEMO_KEY),
    );
    expect(huge.status).toBe(413);
  });

  it("answers 10,000 items in one call", async () => {
    const response = await new Client().postJson(
      "/api/v1/energy/evaluate",
      { items: Array(10_000).fill(waterItem) },
      bearer(DEMO_KEY),
    );
    expect(response.status).toBe(200);
    const { results } = (await response.json()) as {
      results: { ok: boolean }[];
    };
    expect(results).toHaveLength(10_000);
    expect(results.every((r) => r.ok)).toBe(true);
  });

  it("unknown API routes answer a JSON 404", async () => {
    const response = await new Client().get("/api/v1/nope");
    expect(response.status).toBe(404);
    expect(await response.json()).toMatchObject({
      error: { code: "not_found" },
    });
  });
});
