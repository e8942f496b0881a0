import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { canonicalJson, hashPayload } from "./prepare-readings.server";

/**
 * The canonical form as first written: stored payload hashes were made with
 * it, so a repeat is recognised only while the text stays the same.
 */
function reference(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(reference).join(",")}]`;
  if (value && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).sort(
      ([a], [b]) => (a < b ? -1 : a > b ? 1 : 0),
    );
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${reference(v)}`).join(",")}}`;
  }
  return JSON.stringify(value);
}

/** A small seeded generator (mulberry32), so a failure can be replayed. */
function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const KEYS = [
  "a",
  "b",
  "Z",
  "é",
  "meter",
  "start",
  "10",
  "2",
  "",
  "a b",
  '"q"',
];
const LEAVES = [
  0,
  -0,
  1.5,
  -2e-7,
  1e21,
  123456789.123,
  "x",
  'q"\\\n',
  "é🙂",
  true,
  false,
  null,
];

function value(next: () => number, depth: number): unknown {
  const pick = next();
  if (depth > 3 || pick < 0.5)
    return LEAVES[Math.floor(next() * LEAVES.length)];
  if (pick < 0.7)
    return Array.from({ length: Math.floor(next() * 4) }, () =>
      value(next, depth + 1),
    );
  const object: Record<string, unknown> = {};
  for (let i = Math.floor(next() * 5); i > 0; i--)
    object[KEYS[Math.floor(next() * KEYS.length)]] = value(next, depth + 1);
  return object;
}

describe("payload hashes", () => {
  it("the canonical text and its hash are unchanged for any JSON value", () => {
    const next = random(20261202);
    for (let i = 0; i < 5000; i++) {
      // Through JSON, as a request body arrives.
      const payload = JSON.parse(JSON.stringify({ v: value(next, 0) }));
      expect(canonicalJson(payload)).toBe(reference(payload));
      expect(hashPayload(payload)).toBe(
        createHash("sha256").update(reference(payload)).digest("hex"),
      );
    }
  });

  it("ignores key order", () => {
    expect(hashPayload({ a: 1, b: [1, { d: 2, c: 3 }] })).toBe(
      hashPayload({ b: [1, { c: 3, d: 2 }], a: 1 }),
    );
  });
});
