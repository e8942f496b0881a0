import { describe, expect, it } from "vitest";
import {
  PhysicsError,
  PhysicsInputError,
  PhysicsRangeError,
  requireFinite,
  requireNonNegative,
  requirePositive,
} from "./errors";

describe("physics errors", () => {
  it("prefix the message with the field and keep the bare reason", () => {
    const e = new PhysicsRangeError("41 bar a is outside 0.006-40 bar a", "p");
    expect(e).toBeInstanceOf(PhysicsError);
    expect(e).toBeInstanceOf(Error);
    expect(e.name).toBe("PhysicsRangeError");
    expect(e.message).toBe("p: 41 bar a is outside 0.006-40 bar a");
    expect(e.reason).toBe("41 bar a is outside 0.006-40 bar a");
    expect(e.field).toBe("p");
  });

  it("reject NaN and infinities as input errors", () => {
    expect(() => requireFinite("x", Number.NaN)).toThrow(PhysicsInputError);
    expect(() => requireFinite("x", Infinity)).toThrow(/finite/);
    expect(requireFinite("x", -2)).toBe(-2);
  });

  it("tell zero-or-positive from strictly positive", () => {
    expect(requireNonNegative("m", 0)).toBe(0);
    expect(() => requireNonNegative("m", -1e-9)).toThrow(PhysicsInputError);
    expect(() => requirePositive("c", 0)).toThrow(/greater than zero/);
  });
});
