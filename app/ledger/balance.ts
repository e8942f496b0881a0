/**
 * The site energy balance of one month, as a flow diagram (pure; no database).
 *
 * The thermodynamic view (design.md): heat and work into the site are
 * positive, out of it negative; every meter's figure arrives signed from the
 * monthly rollups, as a decimal string. A flow diagram needs positive
 * widths, so links carry magnitudes and keep the sign in `signedKwh` and in
 * the labels. (The per-carrier `boundary` figures are the other view,
 * delivered and exported energy, as the ledger shows them: delivered.ts.)
 *
 * - What enters flows from "Into the site (<carrier>)" through its boundary
 *   meter into the site node; exports (and chilled water, cooling delivered
 *   as heat leaving the site) flow out of the site node to their meter.
 *   Σ into the site − Σ out of it = the net, Q + W.
 * - A parent meter splits into its sub-meters plus a "Distribution loss" node
 *   for the residual, parent − Σ sub-meters, when that residual is a loss
 *   (positive in the parent's direction). Sub-meters that add up to more than
 *   their parent cannot be drawn as a split: the parent flows on undivided and
 *   the balance lists it as a problem.
 */

import {
  carrierLabels,
  carrierReportOrder,
  type Carrier,
  type MeterPosition,
  type Orientation,
} from "~/sites/meter-kinds";

export interface BalanceMeter {
  id: string;
  code: string;
  name: string;
  carrier: Carrier;
  orientation: Orientation;
  parentMeterId: string | null;
  /** Inside the boundary: drawn apart, never as energy crossing it. */
  position: MeterPosition;
  retired: boolean;
  /** Signed energy of the month, kWh (decimal string), into the site positive. */
  energyKwh: string;
  /** The part of it from estimated intervals, kWh (decimal string). */
  estimatedKwh: string;
}

export type ResidualFlag = "ok" | "over_tolerance" | "children_exceed_parent";

export interface ParentBalance {
  meterId: string;
  code: string;
  name: string;
  carrier: Carrier;
  /** The parent meter's signed energy, kWh (decimal string). */
  parentKwh: string;
  /** Σ of its direct sub-meters, kWh (decimal string). */
  childrenKwh: string;
  /** parent − Σ sub-meters, kWh (decimal string): the distribution loss. */
  residualKwh: string;
  /**
   * residual ÷ parent: positive is a loss in the parent's own direction (also
   * for chilled water, where both are negative); null when the parent is zero.
   */
  residualFraction: number | null;
  childCount: number;
  flag: ResidualFlag;
}

/**
 * Boundary meters only (no parent): what crosses the site's boundary, as
 * delivered (≥ 0) and exported (≤ 0) energy of the carrier, the ledger's
 * view: chilled water is cooling delivered, positive.
 */
export interface CarrierBoundary {
  carrier: Carrier;
  importsKwh: string;
  exportsKwh: string;
  netKwh: string;
}

export interface SiteBalance {
  /** YYYY-MM, a site-local month. */
  month: string;
  meters: BalanceMeter[];
  parents: ParentBalance[];
  boundary: CarrierBoundary[];
  /**
   * The thermodynamic net, Q + W into the site over every boundary meter,
   * kWh (decimal string): the only figure that adds carriers, as the first
   * law does.
   */
  netKwh: string;
}

/**
 * How far a parent and its sub-meters may disagree before the residual is
 * flagged: 5 % of the parent. A setting of the site's practice, not physics;
 * for heat networks a residual of a few percent is common practice.
 */
export const RESIDUAL_TOLERANCE = 0.05;

/** An exact decimal: digits × 10^−scale. */
interface Decimal {
  digits: bigint;
  scale: number;
}

function decimal(value: string | number): Decimal {
  const text = (
    typeof value === "number" ? value.toFixed(9) : value.trim()
  ).replace("−", "-");
  const match = /^([+-]?)(\d*)(?:\.(\d*))?$/.exec(text);
  if (!match || (match[2] === "" && !match[3]))
    throw new Error(`Not a decimal number: ${value}`);
  const fraction = match[3] ?? "";
  const digits = BigInt(`${match[2] || "0"}${fraction}`);
  return {
    digits: match[1] === "-" ? -digits : digits,
    scale: fraction.length,
  };
}

function atScale(d: Decimal, scale: number): bigint {
  return d.digits * 10n ** BigInt(scale - d.scale);
}

/**
 * Flags a parent meter against its sub-meters, exactly (decimal arithmetic,
 * no rounding): sub-meters that add up to more than the parent (a negative
 * loss) are a problem in themselves; otherwise a residual above the tolerance
 * is flagged, one at the tolerance is not.
 */
export function residualFlag(
  parentKwh: string | number,
  childrenKwh: string | number,
  tolerance: number = RESIDUAL_TOLERANCE,
): ResidualFlag {
  const p = decimal(parentKwh);
  const c = decimal(childrenKwh);
  const t = decimal(tolerance);
  const scale = Math.max(p.scale, c.scale);
  const parent = atScale(p, scale);
  const residual = parent - atScale(c, scale);
  if (parent === 0n) return residual === 0n ? "ok" : "children_exceed_parent";
  // residual ÷ parent compared with the tolerance, both sides times parent².
  const lossTimesParent = residual * parent;
  if (lossTimesParent < 0n) return "children_exceed_parent";
  const limit = t.digits * parent * parent;
  return lossTimesParent * 10n ** BigInt(t.scale) > limit
    ? "over_tolerance"
    : "ok";
}

/**
 * A signed decimal string rounded for reading (half away from zero), with
 * thousands separators and a true minus sign; no binary floating point.
 */
export function formatDecimal(value: string, fractionDigits = 1): string {
  const d = decimal(value);
  const negative = d.digits < 0n;
  let magnitude = negative ? -d.digits : d.digits;
  if (d.scale > fractionDigits) {
    const divisor = 10n ** BigInt(d.scale - fractionDigits);
    magnitude = (magnitude + divisor / 2n) / divisor;
  } else {
    magnitude *= 10n ** BigInt(fractionDigits - d.scale);
  }
  const text = magnitude.toString().padStart(fractionDigits + 1, "0");
  const whole = text.slice(0, text.length - fractionDigits);
  const fraction = text.slice(text.length - fractionDigits);
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  const sign = magnitude === 0n ? "" : negative ? "−" : "+";
  return `${sign}${grouped}${fractionDigits > 0 ? `.${fraction}` : ""}`;
}

/** `plant` and `ambient` are added by app/plant/plant-balance.ts. */
export type BalanceNodeKind =
  "imports" | "meter" | "site" | "loss" | "plant" | "ambient";

export interface BalanceNode {
  /** Shown beside the node. */
  name: string;
  kind: BalanceNodeKind;
  carrier: Carrier | null;
  /** The node's signed energy, kWh: a meter's reading, the site's net, a loss. */
  signedKwh: number;
  meterId?: string;
}

export interface BalanceLink {
  source: number;
  target: number;
  /** The magnitude, kWh: the width of the flow. */
  value: number;
  /** The same energy with its sign, as the meter at the flow's meter end reads it. */
  signedKwh: number;
  carrier: Carrier;
  /** A plant's conversion loss: drawn grey, whatever fuel it was. */
  loss?: boolean;
}

export interface BalanceProblem {
  meterId: string;
  code: string;
  kind: "children_exceed_parent" | "opposite_direction" | "orphan";
  message: string;
}

export interface BalanceDiagram {
  nodes: BalanceNode[];
  links: BalanceLink[];
  problems: BalanceProblem[];
  /** Index of the site node. */
  site: number;
}

/** Nodes and links for a flow diagram of the site's month. */
export function balanceDiagram(
  balance: Pick<SiteBalance, "meters" | "parents" | "netKwh">,
  siteName: string,
): BalanceDiagram {
  const nodes: BalanceNode[] = [];
  const links: BalanceLink[] = [];
  const problems: BalanceProblem[] = [];
  const indexOf = new Map<string, number>();
  const node = (key: string, make: () => BalanceNode): number => {
    let index = indexOf.get(key);
    if (index === undefined) {
      index = nodes.push(make()) - 1;
      indexOf.set(key, index);
    }
    return index;
  };
  const site = node("site", () => ({
    name: siteName,
    kind: "site",
    carrier: null,
    signedKwh: Number(balance.netKwh),
  }));

  const byId = new Map(balance.meters.map((m) => [m.id, m]));
  const children = new Map<string, BalanceMeter[]>();
  for (const m of balance.meters) {
    if (!m.parentMeterId) continue;
    if (!byId.has(m.parentMeterId)) {
      problems.push({
        meterId: m.id,
        code: m.code,
        kind: "orphan",
        message: `${m.code}: its parent meter is not on this site, so it is left out of the diagram.`,
      });
      continue;
    }
    children.set(m.parentMeterId, [
      ...(children.get(m.parentMeterId) ?? []),
      m,
    ]);
  }
  const parents = new Map(balance.parents.map((p) => [p.meterId, p]));

  const meterNode = (m: BalanceMeter) =>
    node(`meter:${m.id}`, () => ({
      name: `${m.code} · ${m.name}`,
      kind: "meter",
      carrier: m.carrier,
      signedKwh: Number(m.energyKwh),
      meterId: m.id,
    }));
  const link = (
    source: () => number,
    target: () => number,
    signedKwh: number,
    carrier: Carrier,
  ) => {
    const value = Math.abs(signedKwh);
    if (value === 0) return;
    links.push({
      source: source(),
      target: target(),
      value,
      signedKwh,
      carrier,
    });
  };

  const visited = new Set<string>();
  /** Draws a meter and what hangs under it; `direction` +1 flows into the site, −1 out of it. */
  const draw = (m: BalanceMeter, direction: 1 | -1) => {
    visited.add(m.id);
    const kwh = Number(m.energyKwh);
    const here = () => meterNode(m);
    const kids = (children.get(m.id) ?? []).filter((k) => !visited.has(k.id));
    const balanceOf = parents.get(m.id);
    let split = kids.length > 0 && balanceOf !== undefined;
    if (split && balanceOf?.flag === "children_exceed_parent") {
      split = false;
      problems.push({
        meterId: m.id,
        code: m.code,
        kind: "children_exceed_parent",
        message: `${m.code}: its sub-meters add up to more than it reads (residual ${formatDecimal(balanceOf.residualKwh)} kWh), so it is not split into them.`,
      });
    } else if (split && kids.some((k) => Number(k.energyKwh) * direction < 0)) {
      split = false;
      problems.push({
        meterId: m.id,
        code: m.code,
        kind: "opposite_direction",
        message: `${m.code}: a sub-meter runs the other way from it, so it is not split into its sub-meters.`,
      });
    }
    if (!split) {
      if (direction > 0) link(here, () => site, kwh, m.carrier);
      else link(() => site, here, kwh, m.carrier);
      return;
    }
    for (const kid of kids) {
      const kidKwh = Number(kid.energyKwh);
      if (direction > 0) link(here, () => meterNode(kid), kidKwh, kid.carrier);
      else link(() => meterNode(kid), here, kidKwh, kid.carrier);
      if (kidKwh !== 0 || children.has(kid.id)) draw(kid, direction);
    }
    const residual = Number(balanceOf!.residualKwh);
    if (residual * direction <= 0) return;
    const loss = () =>
      node(`loss:${m.carrier}:${direction}`, () => ({
        name: `Distribution loss (${carrierLabels[m.carrier]})`,
        kind: "loss",
        carrier: m.carrier,
        signedKwh: 0,
      }));
    nodes[loss()].signedKwh += residual;
    if (direction > 0) {
      link(here, loss, residual, m.carrier);
      link(loss, () => site, residual, m.carrier);
    } else {
      link(() => site, loss, residual, m.carrier);
      link(loss, here, residual, m.carrier);
    }
  };

  // Internal meters (a plant's inputs and outputs) measure energy already
  // counted at the boundary: drawn as crossing it, a boiler's heat would
  // stand beside the gas it was made from.
  const roots = balance.meters
    .filter((m) => m.parentMeterId === null && m.position === "boundary")
    .sort(
      (a, b) =>
        carrierReportOrder.indexOf(a.carrier) -
          carrierReportOrder.indexOf(b.carrier) || a.code.localeCompare(b.code),
    );
  for (const root of roots) {
    const kwh = Number(root.energyKwh);
    if (kwh === 0) {
      // Nothing crossed the boundary here; sub-meters reading anything are a problem.
      const p = parents.get(root.id);
      if (p && p.flag === "children_exceed_parent")
        problems.push({
          meterId: root.id,
          code: root.code,
          kind: "children_exceed_parent",
          message: `${root.code}: it reads nothing this month, but its sub-meters do (${formatDecimal(p.childrenKwh)} kWh).`,
        });
      continue;
    }
    const direction = kwh > 0 ? 1 : -1;
    if (direction > 0) {
      const imports = node(`imports:${root.carrier}`, () => ({
        name: `Into the site (${carrierLabels[root.carrier]})`,
        kind: "imports",
        carrier: root.carrier,
        signedKwh: 0,
      }));
      nodes[imports].signedKwh += kwh;
      link(
        () => imports,
        () => meterNode(root),
        kwh,
        root.carrier,
      );
    }
    draw(root, direction);
  }
  return { nodes, links, problems, site };
}
