// The OpenAPI 3.1 fragment served for the evaluate endpoint.

import { describe, expect, it } from "vitest";
import { QUANTITIES, evaluateOpenApi } from "./evaluate-schema";

const schemas = evaluateOpenApi.components.schemas;

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

describe("evaluateOpenApi", () => {
  it("names the request, item and result components", () => {
    for (const id of [
      "EvaluateRequest",
      "EvaluateItem",
      "EvaluateResult",
      "EvaluateResponse",
      "WaterHeatItem",
      "HeatRegisterItem",
    ]) {
      expect(schemas[id], id).toBeDefined();
    }
  });

  it("resolves every $ref inside the components", () => {
    const refs = refsIn(schemas);
    expect(refs.length).toBeGreaterThan(5);
    for (const ref of refs) {
      const id = ref.replace("#/components/schemas/", "");
      expect(schemas[id], ref).toBeDefined();
    }
  });

  it("carries no $schema or $id inside components", () => {
    for (const schema of Object.values(schemas)) {
      expect(schema).not.toHaveProperty("$schema");
      expect(schema).not.toHaveProperty("$id");
    }
  });

  it("discriminates items by quantity", () => {
    const d = schemas.EvaluateItem?.discriminator as {
      propertyName: string;
      mapping: Record<string, string>;
    };
    expect(d.propertyName).toBe("quantity");
    expect(Object.keys(d.mapping).sort()).toEqual([...QUANTITIES].sort());
  });

  it("marks items strict and lists the required water_heat fields", () => {
    const w = schemas.WaterHeatItem as {
      additionalProperties: unknown;
      required: string[];
    };
    expect(w.additionalProperties).toBe(false);
    expect(w.required).toEqual(
      expect.arrayContaining([
        "quantity",
        "volume_m3",
        "flow_temp_c",
        "return_temp_c",
      ]),
    );
  });
});
