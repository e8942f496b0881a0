/**
 * The site's energy balance for one month: the boundary per carrier as
 * delivered and exported energy (the ledger's view), then a flow diagram in
 * the thermodynamic view, labelled as such, from the boundary meters through
 * the site (drawn in the browser only, it measures the page), and under it
 * each parent meter against its sub-meters, with the residual flagged beyond
 * the tolerance.
 */
import { useMemo } from "react";
import { Form, Link, useNavigate } from "react-router";
import { Sankey, Tooltip, type SankeyNodeProps as NodeProps } from "recharts";
import { flowLabel } from "~/components/boundary";
import { formatKwh, formatPercent, monthLong } from "~/lib/format";
import { useHydrated } from "~/lib/use-hydrated";
import { useWidth } from "~/lib/use-width";
import {
  Badge,
  Button,
  EmptyState,
  Notice,
  SelectField,
} from "~/components/ui";
import {
  balanceDiagram,
  formatDecimal,
  RESIDUAL_TOLERANCE,
  type BalanceNode,
  type ParentBalance,
  type SiteBalance,
} from "~/ledger/balance";
import { carrierColour } from "~/sites/carrier-colours";
import { CarrierBadge } from "~/components/carrier-badge";
import type { PlantLoss } from "~/plant/conversion-loss";
import { withPlant, type PlantFlow } from "~/plant/plant-balance";
import type { CarrierExergy } from "~/exergy/carrier-exergy";

const HEIGHT = 480;
const MIN_WIDTH = 760;
const NODE_WIDTH = 12;
const MARGIN = { top: 44, right: 12, bottom: 12, left: 12 };

const LOSS_GREY = "#8a929c";

function nodeColour(node: BalanceNode): string {
  if (node.kind === "site") return "#0f5546";
  if (node.kind === "plant") return "#2f3b48";
  if (node.kind === "loss") return LOSS_GREY;
  return node.carrier ? carrierColour(node.carrier) : "#4f5966";
}

const tolerancePercent = formatPercent(RESIDUAL_TOLERANCE, { decimals: 0 });

/**
 * The figure beside a node, always of one carrier. The site and a plant take
 * in unlike carriers, so they show none: their flows carry the figures.
 */
function nodeValueLabel(node: BalanceNode): string {
  if (node.kind === "site") return "uses in the site";
  if (node.kind === "plant") return "plant";
  return flowLabel(node.signedKwh);
}

/** A node with its name and signed energy beside it, outside the flows. */
function NodeShape({
  x,
  y,
  width,
  height,
  payload,
  containerWidth,
  maxChars,
}: NodeProps & { containerWidth: number; maxChars: number }) {
  const node = payload as unknown as BalanceNode;
  const colour = nodeColour(node);
  // Labels sit to the right of their node, over the flows leaving it; the
  // last column has no flows leaving, so its labels sit to the left. The
  // site, where flows arrive and leave, is labelled above its node.
  const last = x + width >= containerWidth - MARGIN.right - 1;
  const first = x <= MARGIN.left + 1;
  let textX = last ? x - 6 : x + width + 6;
  let anchor: "start" | "middle" | "end" = last ? "end" : "start";
  let middle = y + height / 2;
  if (node.kind === "site") {
    textX = last ? x + width : first ? x : x + width / 2;
    anchor = last ? "end" : first ? "start" : "middle";
    middle = y - 22;
  }
  return (
    <g>
      <rect
        x={x}
        y={y}
        width={width}
        height={Math.max(height, 1)}
        fill={colour}
        rx={2}
      />
      <text
        x={textX}
        y={middle - 3}
        textAnchor={anchor}
        fontSize={13}
        fontWeight={600}
        fill={node.kind === "site" ? "#0f5546" : "#1a222d"}
      >
        {clipped(node.name, node.kind === "site" ? Infinity : maxChars)}
      </text>
      <text
        x={textX}
        y={middle + 13}
        textAnchor={anchor}
        fontSize={13}
        fill="#4f5966"
      >
        {nodeValueLabel(node)}
      </text>
    </g>
  );
}

/** How many columns the diagram has: its longest path of flows, plus one. */
function columnCount(
  nodeCount: number,
  links: readonly { source: number; target: number }[],
): number {
  const depth = new Array<number>(nodeCount).fill(0);
  // At most nodeCount passes: the flows form no cycle.
  for (let pass = 0; pass < nodeCount; pass++) {
    let moved = false;
    for (const l of links) {
      if (depth[l.target] < depth[l.source] + 1) {
        depth[l.target] = depth[l.source] + 1;
        moved = true;
      }
    }
    if (!moved) break;
  }
  return Math.max(...depth, 0) + 1;
}

/**
 * A label fits its column (about 7 px a character at 13 px); longer names
 * are cut with an ellipsis, whole in the tooltip.
 */
function labelChars(width: number, columns: number): number {
  const column =
    (width - MARGIN.left - MARGIN.right) / Math.max(columns - 1, 1);
  return Math.max(12, Math.floor((column - NODE_WIDTH - 16) / 7));
}

function clipped(name: string, maxChars: number): string {
  return name.length <= maxChars ? name : `${name.slice(0, maxChars - 1)}…`;
}

interface TooltipItem {
  name?: string;
  signedKwh?: number;
  source?: BalanceNode | number;
  target?: BalanceNode | number;
}

function BalanceChart({
  nodes,
  links,
  siteName,
}: ReturnType<typeof balanceDiagram> & { siteName: string }) {
  const { ref, width } = useWidth();
  const data = useMemo(
    () => ({
      nodes,
      links: links.map((l) => ({
        ...l,
        stroke: l.loss ? LOSS_GREY : carrierColour(l.carrier),
        strokeOpacity: l.loss ? 0.45 : 0.3,
      })),
    }),
    [nodes, links],
  );
  const columns = useMemo(
    () => columnCount(nodes.length, links),
    [nodes, links],
  );
  // Below MIN_WIDTH the labels would collide: the diagram scrolls instead.
  return (
    <div className="overflow-x-auto">
      <div
        ref={ref}
        style={{ width: "100%", minWidth: MIN_WIDTH, height: HEIGHT }}
        role="img"
        aria-label={`Energy balance of ${siteName}: ${nodes.length} nodes, ${links.length} flows`}
      >
        {width > 0 ? (
          <Sankey
            width={width}
            height={HEIGHT}
            data={data}
            nodeWidth={NODE_WIDTH}
            nodePadding={28}
            margin={MARGIN}
            node={(props: NodeProps) => (
              <NodeShape
                {...props}
                containerWidth={width}
                maxChars={labelChars(width, columns)}
              />
            )}
          >
            <Tooltip
              isAnimationActive={false}
              content={({ payload }) => {
                // Each entry wraps the node or the link it describes.
                const entry = payload?.[0]?.payload as
                  { name?: string; payload?: TooltipItem } | undefined;
                if (!entry?.payload) return null;
                const item = entry.payload;
                const title =
                  typeof item.source === "object" &&
                  typeof item.target === "object"
                    ? `${item.source.name} → ${item.target.name}`
                    : (item.name ?? entry.name ?? "");
                return (
                  <div className="rounded border border-line bg-surface px-2 py-1 text-sm shadow">
                    {title} · {flowLabel(item.signedKwh ?? null)}
                  </div>
                );
              }}
            />
          </Sankey>
        ) : null}
      </div>
    </div>
  );
}

/** Exergy beside a heat or cooling carrier's energy, or "no data". */
function ExergyBeside({ exergy }: { exergy: CarrierExergy | undefined }) {
  if (!exergy) return null;
  return (
    <span data-exergy={exergy.carrier}>
      {" "}
      · exergy{" "}
      <span className="tabular-nums">
        {exergy.exergyKwh === null
          ? "no data"
          : `${formatDecimal(exergy.exergyKwh, 0)} kWh`}
      </span>
    </span>
  );
}

function FlagBadge({ parent }: { parent: ParentBalance }) {
  if (parent.flag === "over_tolerance")
    return <Badge tone="copper">Over tolerance</Badge>;
  if (parent.flag === "children_exceed_parent")
    return <Badge tone="danger">Sub-meters exceed parent</Badge>;
  return <span className="text-sm text-ink-muted">Within tolerance</span>;
}

function percent(fraction: number | null): string {
  if (fraction === null) return "—";
  return formatPercent(fraction);
}

function MonthPicker({ months, month }: { months: string[]; month: string }) {
  const navigate = useNavigate();
  const index = months.indexOf(month);
  const older = index >= 0 ? months[index + 1] : months[0];
  const newer = index > 0 ? months[index - 1] : undefined;
  const linkClass =
    "font-semibold text-spruce-700 underline-offset-4 hover:underline";
  return (
    <div className="flex flex-wrap items-end gap-3">
      <Form
        method="get"
        preventScrollReset
        className="flex items-end gap-2"
        aria-label="Month of the energy balance"
      >
        <SelectField
          key={month}
          label="Month"
          name="month"
          defaultValue={month}
          onChange={(event) =>
            navigate(`?month=${event.currentTarget.value}`, {
              preventScrollReset: true,
            })
          }
        >
          {index < 0 ? <option value={month}>{monthLong(month)}</option> : null}
          {months.map((m) => (
            <option key={m} value={m}>
              {monthLong(m)}
            </option>
          ))}
        </SelectField>
        <Button type="submit" variant="secondary">
          Show
        </Button>
      </Form>
      <p className="flex min-h-10 items-center gap-3 text-sm">
        {older ? (
          <Link className={linkClass} to={`?month=${older}`} preventScrollReset>
            ← {monthLong(older)}
          </Link>
        ) : null}
        {newer ? (
          <Link className={linkClass} to={`?month=${newer}`} preventScrollReset>
            {monthLong(newer)} →
          </Link>
        ) : null}
      </p>
    </div>
  );
}

/**
 * Meters inside the boundary (a plant's fuel in, heat or power out): their
 * month in a group of their own, outside the diagram and the totals, which
 * already hold the same energy as it crossed the boundary.
 */
function InsideTheBoundary({
  meters,
  plantLosses,
}: {
  meters: SiteBalance["meters"];
  plantLosses: readonly PlantLoss[];
}) {
  const internal = meters.filter((m) => m.position === "internal");
  if (internal.length === 0 && plantLosses.length === 0) return null;
  return (
    <div data-inside-boundary>
      <h3 className="font-semibold">
        Inside the boundary: plant inputs and outputs
      </h3>
      <ul className="mt-2 space-y-1 text-sm">
        {internal.map((m) => (
          <li key={m.id}>
            <CarrierBadge carrier={m.carrier} />{" "}
            <span className="font-mono">{m.code}</span> {m.name}:{" "}
            <span className="tabular-nums">
              {formatDecimal(m.energyKwh, 0)} kWh
            </span>
          </li>
        ))}
      </ul>
      {plantLosses.length > 0 ? (
        <ul className="mt-2 space-y-1 text-sm" data-conversion-losses>
          {plantLosses.map((p) => (
            <li key={p.plantId}>
              {p.name}: fuel in {formatKwh(p.fuelInKwh)} − out{" "}
              {formatKwh(p.outputsKwh)} ={" "}
              <span className="font-semibold tabular-nums">
                conversion loss {formatKwh(p.lossKwh)}
              </span>
              {p.fault ? (
                <>
                  {" "}
                  <Badge tone="danger">Metering fault</Badge>
                </>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      <p className="mt-2 text-sm text-ink-muted">
        Not counted as delivered or exported: this energy already crossed the
        boundary through the site&apos;s own meters (the fuel a boiler burns,
        say). A plant&apos;s conversion loss is its fuel less its heat and
        electricity; a month beyond the laws is a meter&apos;s fault, not a
        loss. The plant page sets outputs against inputs.
      </p>
    </div>
  );
}

export function SiteBalanceView({
  balance,
  plantLosses = [],
  plantFlows = [],
  exergy = [],
  months,
  siteName,
}: {
  balance: SiteBalance | null;
  plantLosses?: readonly PlantLoss[];
  plantFlows?: readonly PlantFlow[];
  exergy?: readonly CarrierExergy[];
  months: string[];
  siteName: string;
}) {
  // The diagram measures the page, so it renders in the browser only.
  const mounted = useHydrated();
  const diagram = useMemo(
    () =>
      balance
        ? withPlant(
            balanceDiagram(balance, siteName),
            plantFlows,
            balance.meters,
          )
        : null,
    [balance, siteName, plantFlows],
  );
  if (!balance || !diagram)
    return (
      <div className="mt-3">
        <EmptyState title="No monthly figures yet">
          The balance appears once meters on this site have intervals.
        </EmptyState>
      </div>
    );
  return (
    <div className="mt-3 flex flex-col gap-4">
      <MonthPicker months={months} month={balance.month} />
      {balance.boundary.length > 0 ? (
        <ul className="flex flex-wrap gap-x-6 gap-y-1 text-sm">
          {balance.boundary.map((b) => (
            <li key={b.carrier}>
              <CarrierBadge carrier={b.carrier} /> delivered{" "}
              {formatDecimal(b.importsKwh, 0)} kWh · exported{" "}
              {formatDecimal(b.exportsKwh, 0)} kWh · net{" "}
              <span className="font-semibold tabular-nums">
                {formatDecimal(b.netKwh, 0)} kWh
              </span>
              <ExergyBeside
                exergy={exergy.find((e) => e.carrier === b.carrier)}
              />
            </li>
          ))}
        </ul>
      ) : null}
      {exergy.length > 0 ? (
        <p className="-mt-2 text-sm text-ink-muted" data-exergy-note>
          Exergy: the work-equivalent of the heat at each day&apos;s outdoor
          temperature; &ldquo;no data&rdquo; where part of the month has no flow
          and return temperatures, no weather, or estimated or corrected
          intervals.
        </p>
      ) : null}
      {diagram.links.length === 0 ? (
        <p className="text-ink-muted">
          Nothing crossed the boundary in {monthLong(balance.month)}.
        </p>
      ) : (
        <figure>
          {mounted ? (
            <BalanceChart {...diagram} siteName={siteName} />
          ) : (
            <div style={{ height: HEIGHT }} aria-hidden="true" />
          )}
          {/* A method note: the balance is the thermodynamic view, named here. */}
          <figcaption className="mt-2 text-sm text-ink-muted" data-method-note>
            <span className="font-semibold text-ink">Thermodynamic view.</span>{" "}
            {monthLong(balance.month)}, from the monthly ledger: what enters
            through its meter on the left; a plant&apos;s fuel or electricity
            flows into the plant, and the plant into its heat and electricity
            meters inside the boundary and on into the site&apos;s uses, with
            its conversion loss (fuel less what it delivered) drawn grey. A heat
            pump&apos;s heat beyond its electricity is drawn from the outdoor
            air, by difference. Exports and chilled water leave through their
            meters (cooling delivered is heat leaving the site); a parent meter
            splits into its sub-meters and the distribution loss. Each flow is
            one carrier, coloured and labelled as such, its width its kWh;
            unlike carriers are never added, so the site and the plant carry no
            total.
          </figcaption>
        </figure>
      )}
      {diagram.problems.length > 0 ? (
        <Notice tone="caution" title="Not drawn as a split">
          <ul className="mt-1 list-disc space-y-1 pl-5">
            {diagram.problems.map((p) => (
              <li key={`${p.kind}:${p.meterId}`}>{p.message}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      <InsideTheBoundary meters={balance.meters} plantLosses={plantLosses} />
      {balance.parents.length > 0 ? (
        <div>
          <h3 className="font-semibold">Sub-metering</h3>
          {/* The parent meter stays in view while a phone scrolls its figures. */}
          <div className="relative mt-2 overflow-x-auto">
            <table className="w-full min-w-[640px] text-left">
              <thead className="text-sm text-ink-muted">
                <tr>
                  <th className="sticky left-0 z-10 max-w-40 bg-surface py-2 pr-3 font-semibold">
                    Parent meter
                  </th>
                  <th className="py-2 pr-3 text-right font-semibold">
                    Parent, kWh
                  </th>
                  <th className="py-2 pr-3 text-right font-semibold">
                    Σ sub-meters, kWh
                  </th>
                  <th className="py-2 pr-3 text-right font-semibold">
                    Residual, kWh
                  </th>
                  <th className="py-2 pr-3 text-right font-semibold">
                    Residual, % of parent
                  </th>
                  <th className="py-2 font-semibold">Flag</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {balance.parents.map((p) => (
                  <tr key={p.meterId}>
                    <td className="sticky left-0 z-10 max-w-40 bg-surface py-2 pr-3">
                      <span className="font-mono text-sm">{p.code}</span>{" "}
                      {p.name}
                      <span className="text-sm text-ink-muted">
                        {" "}
                        ({p.childCount} sub-meter{p.childCount === 1 ? "" : "s"}
                        )
                      </span>
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">
                      {formatDecimal(p.parentKwh)}
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">
                      {formatDecimal(p.childrenKwh)}
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">
                      {formatDecimal(p.residualKwh)}
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">
                      {percent(p.residualFraction)}
                    </td>
                    <td className="py-2 whitespace-nowrap">
                      <FlagBadge parent={p} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <p className="mt-3 text-sm text-ink-muted">
            Residual: the parent minus the sum of its sub-meters, the
            distribution loss. It is flagged beyond {tolerancePercent} of the
            parent, a setting of the site&apos;s practice (for heat networks a
            few percent is common practice); sub-meters that add up to more than
            their parent are always flagged.
          </p>
        </div>
      ) : null}
    </div>
  );
}
