import { describe, expect, it } from "vitest";
import { supersedes } from "./invoice-status";

describe("invoice snapshots over events", () => {
  it("a new invoice, or one moving forward, is taken", () => {
    expect(supersedes(null, "draft")).toBe(true);
    expect(supersedes("draft", "open")).toBe(true);
    expect(supersedes("open", "paid")).toBe(true);
    expect(supersedes("open", "open")).toBe(true);
  });

  it("a late earlier state is stale", () => {
    expect(supersedes("paid", "open")).toBe(false);
    expect(supersedes("void", "draft")).toBe(false);
    expect(supersedes("paid", "uncollectible")).toBe(false);
  });

  it("a written-off invoice can still be paid", () => {
    expect(supersedes("uncollectible", "paid")).toBe(true);
  });
});
