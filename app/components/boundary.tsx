/**
 * The site's Boundary: a dashed system boundary with its meters as arrows.
 * Imports point in from the left, exports leave to the right, sub-meters hang
 * inside the boundary under their parent. Each arrow carries the signed
 * energy of the last 30 days in the thermodynamic view (into the site
 * positive), so chilled water on an import meter reads negative.
 */
import { Link } from "react-router";
import { carrierColour } from "~/sites/carrier-colours";
import { formatEnergy } from "~/lib/format";
import {
  carrierInText,
  type Carrier,
  type MeterPosition,
  type Orientation,
} from "~/sites/meter-kinds";

export interface BoundaryMeter {
  id: string;
  code: string;
  name: string;
  carrier: Carrier;
  orientation: Orientation;
  parentMeterId: string | null;
  /** Internal meters (a plant's inputs and outputs) sit inside the box. */
  position: MeterPosition;
  retired: boolean;
  energyKwh30d: number | null;
}

const ROW = 58;
const WIDTH = 760;
const BOX = { x: 210, w: 340 };

/** A signed flow across the boundary ("+1.2 MWh", "−850 kWh"), or "no data". */
export function flowLabel(kwh: number | null): string {
  return kwh === null ? "no data" : formatEnergy(kwh, { plus: true });
}

function Arrow({
  meter,
  y,
  orgId,
  direction,
}: {
  meter: BoundaryMeter;
  y: number;
  orgId: string;
  direction: "in" | "out";
}) {
  const colour = carrierColour(meter.carrier);
  const [x1, x2] =
    direction === "in" ? [16, BOX.x + 28] : [BOX.x + BOX.w - 28, WIDTH - 16];
  const head =
    direction === "in"
      ? `M${x2 - 10} ${y - 7} L${x2} ${y} L${x2 - 10} ${y + 7}`
      : `M${x2 - 10} ${y - 7} L${x2} ${y} L${x2 - 10} ${y + 7}`;
  const labelX = direction === "in" ? 18 : BOX.x + BOX.w + 4;
  return (
    <Link
      to={`/o/${orgId}/meters/${meter.id}`}
      aria-label={`${meter.code} ${meter.name}: ${flowLabel(meter.energyKwh30d)} in the last 30 days`}
    >
      <g opacity={meter.retired ? 0.45 : 1}>
        <line
          x1={x1}
          y1={y}
          x2={x2}
          y2={y}
          stroke={colour}
          strokeWidth={4}
          strokeLinecap="round"
        />
        <path
          d={head}
          stroke={colour}
          strokeWidth={4}
          fill="none"
          strokeLinecap="round"
          strokeLinejoin="round"
        />
        <text
          x={labelX}
          y={y - 10}
          fill={colour}
          fontSize="13"
          fontWeight={600}
        >
          {meter.code} · {carrierInText(meter.carrier)}
        </text>
        <text x={labelX} y={y + 22} fill="#1a222d" fontSize="13">
          {flowLabel(meter.energyKwh30d)}
        </text>
      </g>
    </Link>
  );
}

function SubMeter({
  meter,
  y,
  orgId,
  depth,
}: {
  meter: BoundaryMeter;
  y: number;
  orgId: string;
  depth: number;
}) {
  const colour = carrierColour(meter.carrier);
  const x = BOX.x + 40 + depth * 18;
  return (
    <Link
      to={`/o/${orgId}/meters/${meter.id}`}
      aria-label={`Sub-meter ${meter.code}: ${flowLabel(meter.energyKwh30d)} in the last 30 days`}
    >
      <g opacity={meter.retired ? 0.45 : 1}>
        <path
          d={`M${x} ${y - 24} V${y} H${x + 40}`}
          stroke={colour}
          strokeWidth={2.5}
          fill="none"
        />
        <path
          d={`M${x + 32} ${y - 6} L${x + 40} ${y} L${x + 32} ${y + 6}`}
          stroke={colour}
          strokeWidth={2.5}
          fill="none"
        />
        <text x={x + 48} y={y + 4} fill="#1a222d" fontSize="13">
          <tspan fontWeight={600} fill={colour}>
            {meter.code}
          </tspan>{" "}
          {flowLabel(meter.energyKwh30d)}
        </text>
      </g>
    </Link>
  );
}

/** Orders meters for drawing: each top-level meter followed by its sub-meters. */
function layout(meters: BoundaryMeter[]) {
  const children = new Map<string, BoundaryMeter[]>();
  for (const m of meters) {
    if (m.parentMeterId)
      children.set(m.parentMeterId, [
        ...(children.get(m.parentMeterId) ?? []),
        m,
      ]);
  }
  const rows: { meter: BoundaryMeter; depth: number }[] = [];
  const visit = (m: BoundaryMeter, depth: number) => {
    rows.push({ meter: m, depth });
    for (const c of children.get(m.id) ?? []) visit(c, depth + 1);
  };
  const ids = new Set(meters.map((m) => m.id));
  for (const m of meters)
    if (!m.parentMeterId || !ids.has(m.parentMeterId)) visit(m, 0);
  return rows;
}

export function Boundary({
  siteName,
  meters,
  orgId,
}: {
  siteName: string;
  meters: BoundaryMeter[];
  orgId: string;
}) {
  const rows = layout(meters);
  const height = Math.max(160, rows.length * ROW + 70);
  return (
    <figure>
      <svg
        viewBox={`0 0 ${WIDTH} ${height}`}
        className="w-full"
        role="img"
        aria-labelledby="boundary-title"
      >
        <title id="boundary-title">{`Boundary of ${siteName}: ${meters.length} meters`}</title>
        <rect
          x={BOX.x}
          y={12}
          width={BOX.w}
          height={height - 24}
          rx={18}
          fill="#e9f3ef"
          stroke="#0f5546"
          strokeWidth={2.5}
          strokeDasharray="10 7"
        />
        <text
          x={BOX.x + BOX.w / 2}
          y={height - 22}
          textAnchor="middle"
          fill="#0f5546"
          fontSize="13"
          fontWeight={600}
        >
          {siteName}
        </text>
        {rows.map(({ meter, depth }, i) => {
          const y = 46 + i * ROW;
          // An internal meter crosses no boundary: no arrow, inside the box.
          if (depth > 0 || meter.position === "internal")
            return (
              <SubMeter
                key={meter.id}
                meter={meter}
                y={y}
                orgId={orgId}
                depth={Math.max(depth - 1, 0)}
              />
            );
          return (
            <Arrow
              key={meter.id}
              meter={meter}
              y={y}
              orgId={orgId}
              direction={meter.orientation === "import" ? "in" : "out"}
            />
          );
        })}
      </svg>
      {/* A method note: the diagram is the thermodynamic view, named here. */}
      <figcaption className="mt-2 text-sm text-ink-muted" data-method-note>
        Thermodynamic view: arrows in are import meters, arrows out export
        meters; figures are heat and work into the site (+) or out of it (−), so
        a chilled-water import reads − (cooling delivered is heat leaving the
        site). Sub-meters sit inside the boundary under their parent, and so do
        meters inside the boundary (a plant&apos;s inputs and outputs). Figures:
        the last 30 days. Faded: retired meters.
      </figcaption>
    </figure>
  );
}
