import { describe, expect, it } from "vitest";
import {
  balanceDiagram,
  formatDecimal,
  RESIDUAL_TOLERANCE,
  residualFlag,
  type BalanceDiagram,
  type BalanceMeter,
  type ParentBalance,
  type SiteBalance,
} from "./balance";

function meter(
  id: string,
  energyKwh: string,
  extra: Partial<BalanceMeter> = {},
): BalanceMeter {
  return {
    id,
    code: id.toUpperCase(),
    name: `Meter ${id}`,
    carrier: "heat",
    orientation: "import",
    parentMeterId: null,
    position: "boundary",
    retired: false,
    energyKwh,
    estimatedKwh: "0",
    ...extra,
  };
}

/** The parents' balances as the server computes them (here from the meters, in floating point). */
function withParents(
  meters: BalanceMeter[],
): Pick<SiteBalance, "meters" | "parents" | "netKwh"> {
  const parents: ParentBalance[] = [];
  for (const p of meters) {
    const kids = meters.filter((m) => m.parentMeterId === p.id);
    if (kids.length === 0) continue;
    const children = kids.reduce((s, k) => s + Number(k.energyKwh), 0);
    const residual = Number(p.energyKwh) - children;
    parents.push({
      meterId: p.id,
      code: p.code,
      name: p.name,
      carrier: p.carrier,
      parentKwh: p.energyKwh,
      childrenKwh: String(children),
      residualKwh: String(residual),
      residualFraction:
        Number(p.energyKwh) === 0 ? null : residual / Number(p.energyKwh),
      childCount: kids.length,
      flag: residualFlag(p.energyKwh, children),
    });
  }
  const net = meters
    .filter((m) => m.parentMeterId === null)
    .reduce((s, m) => s + Number(m.energyKwh), 0);
  return { meters, parents, netKwh: String(net) };
}

function flowsAt(diagram: BalanceDiagram, index: number) {
  const into = diagram.links
    .filter((l) => l.target === index)
    .reduce((s, l) => s + l.value, 0);
  const out = diagram.links
    .filter((l) => l.source === index)
    .reduce((s, l) => s + l.value, 0);
  return { into, out };
}

const named = (diagram: BalanceDiagram, name: string) =>
  diagram.nodes.findIndex((n) => n.name.startsWith(name));

describe("residualFlag", () => {
  it("the tolerance is 5 % of the parent", () => {
    expect(RESIDUAL_TOLERANCE).toBe(0.05);
  });

  it("flags above the tolerance, not at it (exact decimals)", () => {
    expect(residualFlag("100", "95")).toBe("ok");
    expect(residualFlag("100", "94.999999")).toBe("over_tolerance");
    expect(residualFlag("100.000000", "95.000000")).toBe("ok");
    // 5 % of 79.3 is 3.965: binary floating point would put 79.3 − 75.335 just above it.
    expect(79.3 - 75.335 > 0.05 * 79.3).toBe(true);
    expect(residualFlag("79.3", "75.335")).toBe("ok");
    expect(residualFlag("79.3", "75.334999")).toBe("over_tolerance");
    expect(residualFlag(1000, 960)).toBe("ok");
    expect(residualFlag(1000, 940)).toBe("over_tolerance");
  });

  it("sub-meters that add up to more than the parent are a problem of their own", () => {
    expect(residualFlag("100", "100.000001")).toBe("children_exceed_parent");
    expect(residualFlag("100", "180")).toBe("children_exceed_parent");
    expect(residualFlag("0", "3")).toBe("children_exceed_parent");
    expect(residualFlag("0", "0")).toBe("ok");
    expect(residualFlag("100", "100")).toBe("ok");
  });

  it("chilled water: both negative, a loss is a smaller magnitude below the parent", () => {
    // Parent −100 kWh, sub-meters −95: 5 kWh of cooling gained in the pipes, 5 %.
    expect(residualFlag("-100", "-95")).toBe("ok");
    expect(residualFlag("-100", "-90")).toBe("over_tolerance");
    expect(residualFlag("-100", "-101")).toBe("children_exceed_parent");
  });

  it("takes another tolerance when the site's practice sets one", () => {
    expect(residualFlag("100", "97", 0.02)).toBe("over_tolerance");
    expect(residualFlag("100", "98", 0.02)).toBe("ok");
  });
});

describe("formatDecimal", () => {
  it("rounds half away from zero, groups thousands, keeps the sign", () => {
    expect(formatDecimal("79140.771737")).toBe("+79,140.8");
    expect(formatDecimal("-2627.25")).toBe("−2,627.3");
    expect(formatDecimal("0.04")).toBe("0.0");
    expect(formatDecimal("5035.08", 0)).toBe("+5,035");
    expect(formatDecimal("12", 2)).toBe("+12.00");
  });
});

describe("balanceDiagram", () => {
  const site = "Brookfield";

  it("conserves energy at the site node: Σ in − Σ out = net", () => {
    const balance = withParents([
      meter("hx0", "1000"),
      meter("hxa", "300", { parentMeterId: "hx0" }),
      meter("hxb", "250", { parentMeterId: "hx0" }),
      meter("hxc", "400", { parentMeterId: "hx0" }),
      meter("el", "500", { carrier: "electricity" }),
      meter("pv", "-120", { carrier: "electricity", orientation: "export" }),
      meter("cw", "-80", { carrier: "cooling" }),
    ]);
    const diagram = balanceDiagram(balance, site);
    const { into, out } = flowsAt(diagram, diagram.site);
    expect(into - out).toBeCloseTo(1000 + 500 - 120 - 80, 9);
    expect(diagram.nodes[diagram.site].signedKwh).toBe(1300);
    expect(diagram.links.every((l) => l.value > 0)).toBe(true);
    expect(diagram.problems).toEqual([]);
    // Every meter node passes on what it receives.
    for (const name of ["HX0", "EL"]) {
      const { into: i, out: o } = flowsAt(diagram, named(diagram, name));
      expect(i).toBeCloseTo(o, 9);
    }
  });

  it("splits a parent into its sub-meters plus the distribution loss", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("hx0", "1000"),
        meter("hxa", "300", { parentMeterId: "hx0" }),
        meter("hxb", "250", { parentMeterId: "hx0" }),
        meter("hxc", "400", { parentMeterId: "hx0" }),
      ]),
      site,
    );
    const parent = named(diagram, "HX0");
    const loss = named(diagram, "Distribution loss (Heat)");
    expect(loss).toBeGreaterThan(0);
    expect(diagram.nodes[loss].signedKwh).toBeCloseTo(50, 9);
    const fromParent = diagram.links.filter((l) => l.source === parent);
    expect(
      fromParent.map((l) => [diagram.nodes[l.target].name, l.value]),
    ).toEqual([
      ["HXA · Meter hxa", 300],
      ["HXB · Meter hxb", 250],
      ["HXC · Meter hxc", 400],
      ["Distribution loss (Heat)", 50],
    ]);
    // The loss stays inside the boundary: it reaches the site node like the sub-meters.
    expect(flowsAt(diagram, diagram.site).into).toBeCloseTo(1000, 9);
    expect(
      flowsAt(diagram, named(diagram, "Into the site (Heat)")).out,
    ).toBeCloseTo(1000, 9);
  });

  it("sub-meters exceeding their parent are flagged, not drawn as a negative loss", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("hx0", "1000"),
        meter("hxa", "600", { parentMeterId: "hx0" }),
        meter("hxb", "500", { parentMeterId: "hx0" }),
      ]),
      site,
    );
    expect(named(diagram, "Distribution loss")).toBe(-1);
    expect(named(diagram, "HXA")).toBe(-1);
    expect(diagram.problems).toMatchObject([
      { code: "HX0", kind: "children_exceed_parent" },
    ]);
    expect(diagram.problems[0].message).toContain("−100.0 kWh");
    const { into, out } = flowsAt(diagram, diagram.site);
    expect(into - out).toBeCloseTo(1000, 9);
  });

  it("chilled water (a negative import) leaves the site through its meter", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("hx", "400"),
        meter("cw", "-100", { carrier: "cooling" }),
        meter("cw1", "-60", { carrier: "cooling", parentMeterId: "cw" }),
        meter("cw2", "-36", { carrier: "cooling", parentMeterId: "cw" }),
      ]),
      site,
    );
    const cw = named(diagram, "CW ·");
    const cw1 = named(diagram, "CW1");
    const loss = named(diagram, "Distribution loss (Cooling)");
    expect(named(diagram, "Into the site (Cooling)")).toBe(-1);
    // Out of the site into the sub-meters and the loss, on to the parent, out of the boundary.
    const link = (s: number, t: number) =>
      diagram.links.find((l) => l.source === s && l.target === t);
    expect(link(diagram.site, cw1)).toMatchObject({
      value: 60,
      signedKwh: -60,
    });
    expect(link(cw1, cw)).toMatchObject({ value: 60, signedKwh: -60 });
    expect(link(diagram.site, loss)?.value).toBeCloseTo(4, 9);
    expect(link(loss, cw)?.value).toBeCloseTo(4, 9);
    expect(diagram.nodes[loss].signedKwh).toBeCloseTo(-4, 9);
    expect(diagram.links.some((l) => l.source === cw)).toBe(false);
    expect(flowsAt(diagram, cw).into).toBeCloseTo(100, 9);
    const { into, out } = flowsAt(diagram, diagram.site);
    expect(into - out).toBeCloseTo(300, 9);
    expect(diagram.problems).toEqual([]);
  });

  it("exports leave the site node to their meter, signed negative", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("el", "50", { carrier: "electricity" }),
        meter("pv", "-20", { carrier: "electricity", orientation: "export" }),
      ]),
      site,
    );
    const pv = named(diagram, "PV");
    expect(diagram.links.find((l) => l.target === pv)).toMatchObject({
      source: diagram.site,
      value: 20,
      signedKwh: -20,
    });
    expect(diagram.nodes[pv].signedKwh).toBe(-20);
  });

  it("nested sub-meters split again, each with its own loss", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("a", "1000"),
        meter("b", "900", { parentMeterId: "a" }),
        meter("c", "500", { parentMeterId: "b" }),
        meter("d", "380", { parentMeterId: "b" }),
      ]),
      site,
    );
    const loss = named(diagram, "Distribution loss (Heat)");
    expect(diagram.nodes[loss].signedKwh).toBeCloseTo(100 + 20, 9);
    expect(flowsAt(diagram, named(diagram, "B ·")).into).toBe(900);
    expect(flowsAt(diagram, named(diagram, "B ·")).out).toBeCloseTo(900, 9);
    expect(flowsAt(diagram, diagram.site).into).toBeCloseTo(1000, 9);
  });

  it("draws nothing for meters that read zero", () => {
    const diagram = balanceDiagram(
      withParents([
        meter("hx", "0"),
        meter("el", "0", { carrier: "electricity" }),
      ]),
      site,
    );
    expect(diagram.links).toEqual([]);
    expect(diagram.nodes).toHaveLength(1);
  });
});
