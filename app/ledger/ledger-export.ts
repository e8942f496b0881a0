/**
 * What the ledger's CSV and XLSX files hold: the grid as it is on screen, in
 * the unit chosen there (per m² if chosen), with readable headings and one
 * total row per carrier. The JSON API keeps its machine field names; only
 * these human files change with the screen. Energies stay exact decimal text
 * (convert-energy-decimal.ts) until a writer turns them into cells.
 */
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import {
  carrierTotals,
  type CarrierTotalRow,
  type ServerTotal,
  type TotalInput,
} from "./carrier-totals";
import { convertKwh } from "./convert-energy-decimal";
import { unitLabel, type LedgerUnit } from "./ledger-units";

type Carrier = (typeof carriers)[number];

/** The ledger as the API gives it (ledger-rows.server.ts). */
export interface ExportableLedger {
  from: string;
  to: string;
  rows: (TotalInput & {
    site_name: string;
    month: string;
    net_kwh: string;
    estimated_share: number;
    status: "open" | "closed";
    co2e_kg?: string | null;
    co2e_market_kg?: string | null;
  } & CostCells)[];
  totals: (ServerTotal &
    CostCells & {
      co2e_kg?: string | null;
      co2e_market_kg?: string | null;
    })[];
}

/** A row's or a total's cost (app/tariffs): exact decimal text and its currency, or null. */
interface CostCells {
  cost?: string | null;
  currency?: string | null;
}

export interface ExportOptions {
  unit: LedgerUnit;
  /** Each figure divided by its site's floor area, as on screen. */
  perM2: boolean;
}

/**
 * `text` cells carry words, some typed by people; `month` is YYYY-MM;
 * `energy` and `band` are exact decimal text in the unit (null: no figure);
 * `percent` and `count` are numbers; `area` is decimal text in m².
 */
export type ColumnKind =
  | "text"
  | "month"
  | "energy"
  | "band"
  | "percent"
  | "count"
  | "area"
  | "carbon"
  | "money";

export interface ExportColumn {
  header: string;
  kind: ColumnKind;
}

export type ExportCell = string | number | null;

export interface ExportLine {
  /** A carrier's total row. */
  total: boolean;
  cells: ExportCell[];
}

export interface LedgerExport {
  columns: ExportColumn[];
  lines: ExportLine[];
}

const statusLabels = { open: "Open", closed: "Closed" } as const;

/** The share shown as a percentage, to two places (the screen shows one). */
function percent(share: number): number {
  return Math.round(share * 10_000) / 100;
}

function carrierLabel(carrier: string): string {
  return carrierLabels[carrier as Carrier] ?? carrier;
}

export function ledgerExport(
  ledger: ExportableLedger,
  { unit, perM2 }: ExportOptions,
): LedgerExport {
  const label = unitLabel(unit, perM2);
  const columns: ExportColumn[] = [
    { header: "Site", kind: "text" },
    { header: "Month", kind: "month" },
    { header: "Carrier", kind: "text" },
    ...(perM2 ? [{ header: "Floor area (m²)", kind: "area" as const }] : []),
    { header: `Delivered (${label})`, kind: "energy" },
    { header: `Exported (${label})`, kind: "energy" },
    { header: `Net (${label})`, kind: "energy" },
    { header: `Estimated (${label})`, kind: "energy" },
    { header: "Estimated share (%)", kind: "percent" },
    { header: `± uncertainty (${label})`, kind: "band" },
    { header: `Adjustments (${label})`, kind: "energy" },
    { header: "Adjustment count", kind: "count" },
    // Money is never per m² or in another energy unit: the exact decimal as priced.
    { header: "Cost", kind: "money" },
    { header: "Currency", kind: "text" },
    { header: "Status", kind: "text" },
    // Carbon is kg CO₂e whatever the energy unit, never per m².
    { header: "CO₂e location-based (kg)", kind: "carbon" },
    { header: "CO₂e market-based (kg)", kind: "carbon" },
  ];

  /** kWh text in the unit, per m² of `area` if asked; null where per m² has no area. */
  const energy = (kwh: string | null, area: string | null): string | null => {
    if (kwh === null) return null;
    if (!perM2) return convertKwh(kwh, unit);
    return area !== null && Number(area) > 0
      ? convertKwh(kwh, unit, area)
      : null;
  };
  const figures = (
    r: Omit<CarrierTotalRow, "carrier" | "floor_area_m2">,
    area: string | null,
  ): ExportCell[] => [
    ...(perM2 ? [area] : []),
    energy(r.imports_kwh, area),
    energy(r.exports_kwh, area),
    energy(r.net_kwh, area),
    energy(r.estimated_kwh, area),
    percent(r.estimated_share),
    energy(r.uncertainty_kwh, area),
    energy(r.adjustments_kwh, area),
    r.adjustment_count,
  ];

  const entries: ExportLine[] = ledger.rows.map((r) => ({
    total: false,
    cells: [
      r.site_name,
      r.month,
      carrierLabel(r.carrier),
      ...figures(r, r.floor_area_m2),
      r.cost ?? null,
      r.currency ?? null,
      statusLabels[r.status],
      r.co2e_kg ?? null,
      r.co2e_market_kg ?? null,
    ],
  }));
  const totals: ExportLine[] = carrierTotals(
    ledger.rows,
    ledger.totals,
    carriers as readonly string[],
  ).map((t) => {
    const server = ledger.totals.find((s) => s.carrier === t.carrier);
    return {
      total: true,
      cells: [
        "Total",
        null,
        carrierLabel(t.carrier),
        ...figures(t, t.floor_area_m2),
        server?.cost ?? null,
        server?.currency ?? null,
        null,
        server?.co2e_kg ?? null,
        server?.co2e_market_kg ?? null,
      ],
    };
  });
  return { columns, lines: [...entries, ...totals] };
}

/** The download's name: period, unit, and per m² when chosen. */
export function exportFilename(
  ledger: { from: string; to: string },
  { unit, perM2 }: ExportOptions,
  ext: "csv" | "xlsx",
): string {
  return `joulebook-ledger-${ledger.from}-to-${ledger.to}-${unit}${perM2 ? "-per-m2" : ""}.${ext}`;
}
