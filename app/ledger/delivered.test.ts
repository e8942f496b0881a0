import { describe, expect, it } from "vitest";
import { carriers } from "~/sites/meter-kinds";
import { deliveredSign, deliveredSignSql } from "./delivered";

describe("the delivered view's sign", () => {
  it("turns cooling only: its delivery is heat leaving the site", () => {
    expect(
      Object.fromEntries(carriers.map((c) => [c, deliveredSign(c)])),
    ).toEqual({
      heat: 1,
      cooling: -1,
      steam: 1,
      electricity: 1,
    });
  });

  it("says the same in SQL", () => {
    expect(deliveredSignSql("m.carrier")).toBe(
      "(case when m.carrier in ('cooling') then -1 else 1 end)",
    );
  });
});
