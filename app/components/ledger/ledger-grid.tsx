import {
  CellStyleModule,
  ClientSideRowModelModule,
  ModuleRegistry,
  PinnedRowModule,
  RowAutoHeightModule,
  RowStyleModule,
  type ColDef,
  type ICellRendererParams,
  type RowClassParams,
  type RowStyle,
  type ValueGetterParams,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { gridTheme } from "~/components/grid-theme";
import { useMemo } from "react";
import { Link } from "react-router";
import { CarrierBadge } from "~/components/carrier-badge";
import { Badge } from "~/components/ui";
import { carrierTotals } from "~/ledger/carrier-totals";
import { addExact, convertKwh } from "~/ledger/convert-energy-decimal";
import {
  LEDGER_UNITS,
  unitLabel as labelOf,
  type LedgerUnit,
} from "~/ledger/ledger-units";
import { formatCost, formatNumber, monthShort } from "~/lib/format";
import { useWidth } from "~/lib/use-width";
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import type { Ledger, LedgerRow } from "./use-ledger";

// Only the modules this grid uses. Row grouping is not among the community
// modules, so the grouping is drawn: rows come sorted by site, month and
// carrier, and a site or month is written only where it starts.
ModuleRegistry.registerModules([
  ClientSideRowModelModule,
  CellStyleModule,
  RowStyleModule,
  PinnedRowModule,
  RowAutoHeightModule,
]);

/**
 * Below this width (a phone) the site, month and carrier share one column
 * pinned at the left, so the figures start beside it instead of off screen.
 */
const NARROW_GRID_PX = 600;

interface GridRow extends Omit<LedgerRow, "carrier" | "status"> {
  id: string;
  carrier: LedgerRow["carrier"] | null;
  status: LedgerRow["status"] | null;
  firstOfSite: boolean;
  firstOfMonth: boolean;
  isTotal: boolean;
}

const carrierOrder = (carrier: LedgerRow["carrier"]) =>
  (carriers as readonly string[]).indexOf(carrier);

function sortRows(rows: LedgerRow[]): GridRow[] {
  const sorted = [...rows].sort(
    (a, b) =>
      a.site_name.localeCompare(b.site_name, "en-GB") ||
      a.site_id.localeCompare(b.site_id) ||
      a.month.localeCompare(b.month) ||
      carrierOrder(a.carrier) - carrierOrder(b.carrier),
  );
  return sorted.map((row, i) => {
    const previous = sorted[i - 1];
    const firstOfSite = !previous || previous.site_id !== row.site_id;
    return {
      ...row,
      id: `${row.site_id}|${row.month}|${row.carrier}`,
      firstOfSite,
      firstOfMonth: firstOfSite || previous.month !== row.month,
      isTotal: false,
    };
  });
}

/** The totals rows, one per carrier (carrier-totals.ts): unlike carriers are never added. */
function totalRows(ledger: Ledger): GridRow[] {
  return carrierTotals(ledger.rows, ledger.totals, carriers).map((total) => ({
    ...total,
    ...carbonOfTotal(ledger, total.carrier),
    ...costOfTotal(ledger, total.carrier),
    id: `total|${total.carrier}`,
    site_id: "",
    site_name: "Total",
    month: "",
    status: null,
    closed_at: null,
    // Exergy is shown per row only (see exergyColumn).
    exergy_kwh: null,
    firstOfSite: true,
    firstOfMonth: true,
    isTotal: true,
  }));
}

/** A carrier's carbon: the server's exact sums, and its adjustments added exactly. */
function carbonOfTotal(ledger: Ledger, carrier: LedgerRow["carrier"]) {
  const server = ledger.totals.find((t) => t.carrier === carrier);
  const mine = ledger.rows.filter((r) => r.carrier === carrier);
  return {
    co2e_kg: server?.co2e_kg ?? null,
    co2e_market_kg: server?.co2e_market_kg ?? null,
    co2e_adjustments_kg: addExact(mine.map((r) => r.co2e_adjustments_kg)),
    co2e_market_adjustments_kg: addExact(
      mine.map((r) => r.co2e_market_adjustments_kg),
    ),
  };
}

/** A carrier's cost total, the exact sum the API gives beside its energy. */
function costOfTotal(ledger: Ledger, carrier: LedgerRow["carrier"]) {
  const total = ledger.totals.find((t) => t.carrier === carrier);
  return {
    cost: total?.cost ?? null,
    currency: total?.currency ?? null,
    adjustments_cost: null,
  };
}

function CarrierCell({ data }: ICellRendererParams<GridRow>) {
  return data?.carrier ? <CarrierBadge carrier={data.carrier} /> : null;
}

/**
 * The adjustments of a closed month, as a link to their entries in the audit
 * trail when the reader may open it (`linkTo` is given), else as text.
 */
function AdjustmentsCell({
  valueFormatted,
  data,
  linkTo,
}: ICellRendererParams<GridRow> & {
  linkTo?: (row: LedgerRow) => string;
}) {
  if (!valueFormatted) return null;
  if (!linkTo || !data || data.isTotal || !data.adjustment_count)
    return <>{valueFormatted}</>;
  const count = data.adjustment_count;
  return (
    <Link
      to={linkTo(data as LedgerRow)}
      className="font-semibold text-spruce-700 underline"
      title={`Open the ${count} adjusting ${count === 1 ? "entry" : "entries"} in the audit trail`}
    >
      {valueFormatted}
    </Link>
  );
}

function StatusCell({ value }: ICellRendererParams<GridRow>) {
  if (value === "closed") return <Badge tone="spruce">Closed</Badge>;
  if (value === "open") return <Badge>Open</Badge>;
  return null;
}

/** A repeated site or month stays readable to screen readers only. */
function GroupCell({
  value,
  valueFormatted,
  data,
  colDef,
}: ICellRendererParams<GridRow>) {
  const text = valueFormatted ?? value;
  const first =
    colDef?.field === "site_name" ? data?.firstOfSite : data?.firstOfMonth;
  if (data?.isTotal) return <strong>{text}</strong>;
  return first ? (
    <span className="font-semibold" title={text}>
      {text}
    </span>
  ) : (
    <span className="sr-only">{text}</span>
  );
}

/** Phone layout: site (where it starts), then month and carrier, in one cell. */
function EntryCell({ data }: ICellRendererParams<GridRow>) {
  if (!data) return null;
  const carrier = data.carrier ? carrierLabels[data.carrier] : "";
  // One total a carrier: unlike carriers are never added.
  if (data.isTotal) return <strong>Total · {carrier}</strong>;
  return (
    <span className="block py-1.5 leading-snug">
      <span className={data.firstOfSite ? "block font-semibold" : "sr-only"}>
        {data.site_name}
      </span>
      {monthShort(data.month)} · {carrier}
    </span>
  );
}

const entryColumn: ColDef<GridRow> = {
  headerName: "Site · month · carrier",
  colId: "entry",
  valueGetter: (p) => p.data?.site_name ?? "",
  cellRenderer: EntryCell,
  pinned: "left",
  width: 124,
  wrapText: true,
  autoHeight: true,
};

/**
 * Carbon in whole kg, never per m² or converted with the energy unit; a dash
 * where the carrier has no factor set for the year.
 */
function carbonColumn(
  headerName: string,
  pick: (row: GridRow) => string | null,
): ColDef<GridRow> {
  return {
    headerName,
    type: "rightAligned",
    valueGetter: (p) => (p.data ? pick(p.data) : null),
    valueFormatter: (p) =>
      p.value === null || p.value === undefined
        ? "—"
        : formatNumber(Number(p.value), 0, { fixed: true }),
    cellClass: ["ag-right-aligned-cell", "tabular-nums"],
    minWidth: 96,
    flex: 1,
  };
}

const defaultColumn: ColDef<GridRow> = {
  sortable: false,
  resizable: false,
  wrapHeaderText: true,
  autoHeaderHeight: true,
};

/** The carriers whose rows may carry exergy (heat and chilled water). */
const HAS_EXERGY = new Set<LedgerRow["carrier"]>(["heat", "cooling"]);

/**
 * Exergy beside the energy: on a heat or cooling row its figure or "no data"
 * (app/exergy says when it cannot be had); blank on other rows and totals.
 */
function exergyColumn(column: ColDef<GridRow>): ColDef<GridRow> {
  const format = column.valueFormatter as (p: { value: unknown }) => string;
  return {
    ...column,
    colId: "exergy",
    headerTooltip:
      "The work-equivalent of the heat at each day's outdoor temperature",
    valueFormatter: (p) => {
      if (!p.data?.carrier || p.data.isTotal) return "";
      if (!HAS_EXERGY.has(p.data.carrier)) return "";
      return p.value === null ? "no data" : format(p);
    },
    cellStyle: (p) => (p.value === null ? { color: "#6b7480" } : null),
  };
}

function rowStyle(p: RowClassParams<GridRow>): RowStyle | undefined {
  if (p.node.rowPinned) return { background: "#f4f1ea", fontWeight: 600 };
  if (p.data?.firstOfSite && p.node.rowIndex)
    return { borderTop: "2px solid #b9b1a2" };
  return undefined;
}

export function LedgerGrid({
  ledger,
  unit,
  perM2,
  adjustmentsLink,
  showExergy = false,
}: {
  ledger: Ledger;
  /** A column of exergy for heat and cooling rows ("no data" where unknown). */
  showExergy?: boolean;
  unit: LedgerUnit;
  perM2: boolean;
  /** Where a row's adjusting entries are listed; none for roles without the audit trail. */
  adjustmentsLink?: (row: LedgerRow) => string;
}) {
  const rows = useMemo(() => sortRows(ledger.rows), [ledger]);
  const totals = useMemo(() => totalRows(ledger), [ledger]);
  const { ref, width } = useWidth();
  const narrow = width > 0 && width < NARROW_GRID_PX;
  const hasHeat = showExergy;

  const columns = useMemo<ColDef<GridRow>[]>(() => {
    const { decimals } = LEDGER_UNITS[unit];
    const places = perM2 ? decimals.perM2 : decimals.total;
    // The unit's own decimals, the same on screen and in the XLSX file.
    const figure = (value: number, plus = false) =>
      formatNumber(value, places, { fixed: true, plus });
    const unitLabel = labelOf(unit, perM2);

    /**
     * A kWh string in the chosen unit, per m² if asked; null if none. The
     * conversion is the exports' own (convert-energy-decimal.ts), so screen
     * and files agree.
     */
    const energy =
      (pick: (row: GridRow) => string | null) =>
      (p: ValueGetterParams<GridRow>): number | null => {
        if (!p.data) return null;
        const kwh = pick(p.data);
        if (kwh === null) return null;
        if (!perM2) return Number(convertKwh(kwh, unit));
        const area = p.data.floor_area_m2;
        return area !== null && Number(area) > 0
          ? Number(convertKwh(kwh, unit, area))
          : null;
      };
    const show = (value: number | null) =>
      value === null ? "—" : figure(value);
    const energyColumn = (
      headerName: string,
      pick: (row: GridRow) => string | null,
    ): ColDef<GridRow> => ({
      headerName: `${headerName} (${unitLabel})`,
      type: "rightAligned",
      valueGetter: energy(pick),
      valueFormatter: (p) => show(p.value),
      cellClass: ["ag-right-aligned-cell", "tabular-nums"],
      minWidth: 88,
      flex: 1,
    });

    const labelColumns: ColDef<GridRow>[] = narrow
      ? [entryColumn]
      : [
          {
            headerName: "Site",
            field: "site_name",
            cellRenderer: GroupCell,
            minWidth: 128,
            flex: 1.5,
          },
          {
            headerName: "Month",
            field: "month",
            valueFormatter: (p) => (p.value ? monthShort(p.value) : ""),
            cellRenderer: GroupCell,
            minWidth: 88,
            flex: 1,
          },
          {
            headerName: "Carrier",
            field: "carrier",
            valueFormatter: (p) =>
              p.value ? carrierLabels[p.value as LedgerRow["carrier"]] : "",
            cellRenderer: CarrierCell,
            minWidth: 116,
            flex: 1,
          },
        ];
    return [
      ...labelColumns,
      energyColumn("Delivered", (r) => r.imports_kwh),
      energyColumn("Exported", (r) => r.exports_kwh),
      {
        ...energyColumn("Net", (r) => r.net_kwh),
        cellStyle: { fontWeight: 600 },
      },
      ...(hasHeat
        ? [exergyColumn(energyColumn("Exergy", (r) => r.exergy_kwh))]
        : []),
      {
        headerName: "Cost",
        colId: "cost",
        type: "rightAligned",
        valueGetter: (p) => (p.data?.cost == null ? null : Number(p.data.cost)),
        valueFormatter: (p) =>
          p.data?.cost == null || p.data.currency === null
            ? "—"
            : formatCost(p.data.cost, p.data.currency),
        cellClass: ["ag-right-aligned-cell", "tabular-nums"],
        minWidth: 96,
        flex: 1,
      },
      {
        headerName: "Estimated share (%)",
        field: "estimated_share",
        type: "rightAligned",
        valueFormatter: (p) =>
          Number.isFinite(p.value)
            ? formatNumber(100 * p.value, 1, { fixed: true })
            : "—",
        cellStyle: (p) =>
          p.value > 0 ? { color: "#7a4b00", fontWeight: 600 } : null,
        cellClass: ["ag-right-aligned-cell", "tabular-nums"],
        minWidth: 84,
        flex: 1,
      },
      {
        ...energyColumn("± uncertainty", (r) => r.uncertainty_kwh),
        valueFormatter: (p) =>
          p.value === null ? "—" : `±${figure(Math.abs(p.value))}`,
      },
      {
        ...energyColumn("Adjustments", (r) => r.adjustments_kwh),
        valueFormatter: (p) => {
          const count = p.data?.adjustment_count ?? 0;
          if (!count && !p.value) return "";
          const amount = p.value === null ? "—" : figure(p.value, true);
          return `${amount} (${count})`;
        },
        cellRenderer: AdjustmentsCell,
        cellRendererParams: { linkTo: adjustmentsLink },
      },
      carbonColumn("CO₂e location-based (kg)", (r) => r.co2e_kg),
      carbonColumn("CO₂e market-based (kg)", (r) => r.co2e_market_kg),
      {
        headerName: "Status",
        field: "status",
        cellRenderer: StatusCell,
        // Kept in view when a narrow screen scrolls the figures sideways.
        pinned: "right",
        minWidth: 88,
        flex: 1,
      },
    ];
  }, [unit, perM2, adjustmentsLink, narrow, hasHeat]);

  // A short ledger takes only the room it needs; a long one scrolls under its
  // header, with the totals kept in view.
  const short = rows.length <= 12;
  return (
    <div ref={ref} style={short ? undefined : { height: 560 }}>
      <AgGridReact<GridRow>
        // A new grid when the layout changes: a grid keeps its columns'
        // widths and pinning across column updates.
        key={narrow ? "narrow" : "wide"}
        domLayout={short ? "autoHeight" : "normal"}
        theme={gridTheme}
        rowData={rows}
        pinnedBottomRowData={totals}
        columnDefs={columns}
        defaultColDef={defaultColumn}
        getRowId={(p) => p.data.id}
        getRowStyle={rowStyle}
      />
    </div>
  );
}
