import {
  ClientSideRowModelModule,
  CellStyleModule,
  ModuleRegistry,
  NumberFilterModule,
  PaginationModule,
  RowSelectionModule,
  TextFilterModule,
  type ColDef,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { gridTheme } from "~/components/grid-theme";
import { useCallback, useMemo } from "react";
import { dateTimeIn, dayMonthTimeIn, formatHourKwh } from "~/lib/format";
import { useWidth } from "~/lib/use-width";
import { qualityLabels, type Interval } from "./use-intervals";

// Only the modules this grid uses: the full set adds ~440 kB to the page.
ModuleRegistry.registerModules([
  ClientSideRowModelModule,
  CellStyleModule,
  NumberFilterModule,
  TextFilterModule,
  PaginationModule,
  RowSelectionModule,
]);

/** Quality in the energy manager's words; the API keeps the stored names. */
/**
 * Below this width (a phone) the hour is pinned at the left in a shorter
 * form and every column keeps a readable width, scrolling sideways, instead
 * of all six squeezing into the screen as "5 D…", "m…".
 */
const NARROW_GRID_PX = 600;

/** Readable widths on a phone, px; the first is the pinned hour. */
const NARROW_WIDTHS = [112, 104, 100, 120, 96, 96];

const qualityColour: Record<Interval["quality"], string> = {
  measured: "#0b4238",
  estimated: "#7a4b00",
  edited: "#1c4c80",
  missing: "#8f1d17",
};

export function IntervalGrid({
  intervals,
  timeZone,
  onSelect,
}: {
  intervals: Interval[];
  timeZone: string;
  onSelect: (interval: Interval | null) => void;
}) {
  const { ref, width } = useWidth();
  const narrow = width > 0 && width < NARROW_GRID_PX;
  // A narrow grid leaves out the year, to fit.
  const hourLabel = useCallback(
    (at: string) =>
      narrow ? dayMonthTimeIn(at, timeZone) : dateTimeIn(at, timeZone),
    [timeZone, narrow],
  );
  const columns = useMemo<ColDef<Interval>[]>(() => {
    const all: ColDef<Interval>[] = [
      {
        // The meter's own intervals, so one can be selected and corrected.
        headerName: `Start (${timeZone})`,
        field: "start",
        valueFormatter: (p) => hourLabel(p.value),
        flex: 2,
        sort: "desc",
      },
      {
        headerName: "Energy (kWh)",
        field: "energy_kwh",
        type: "numericColumn",
        valueGetter: (p) => Number(p.data?.energy_kwh),
        valueFormatter: (p) => formatHourKwh(Number(p.value)),
        filter: "agNumberColumnFilter",
        flex: 2,
      },
      {
        headerName: "Quality",
        field: "quality",
        valueFormatter: (p) => qualityLabels[p.value as Interval["quality"]],
        filterValueGetter: (p) => p.data && qualityLabels[p.data.quality],
        filter: "agTextColumnFilter",
        cellStyle: (p) => ({
          color: qualityColour[p.value as Interval["quality"]],
          fontWeight: 600,
        }),
        flex: 1,
      },
      {
        headerName: "Flags",
        field: "flags",
        valueFormatter: (p) => (p.value as string[]).join(", "),
        filter: "agTextColumnFilter",
        flex: 2,
      },
      {
        headerName: "Estimate",
        field: "estimate_method",
        valueFormatter: (p) => p.value ?? "",
        flex: 1,
      },
      {
        headerName: "Readings",
        field: "source_count",
        type: "numericColumn",
        flex: 1,
      },
    ];
    if (!narrow) return all;
    return all.map((column, i) => ({
      ...column,
      minWidth: NARROW_WIDTHS[i],
      // The pinned hour takes its width; the others share what is left.
      ...(i === 0
        ? { pinned: "left", flex: undefined, width: NARROW_WIDTHS[0] }
        : {}),
      wrapHeaderText: true,
      autoHeaderHeight: true,
    }));
  }, [hourLabel, timeZone, narrow]);
  return (
    <div ref={ref} style={{ height: 420 }}>
      <AgGridReact<Interval>
        // A new grid when the layout changes: a grid keeps its columns'
        // widths and pinning across column updates.
        key={narrow ? "narrow" : "wide"}
        theme={gridTheme}
        rowData={intervals}
        columnDefs={columns}
        getRowId={(p) => p.data.start}
        pagination
        paginationPageSize={100}
        paginationPageSizeSelector={[50, 100, 500]}
        rowSelection={{
          mode: "singleRow",
          enableClickSelection: true,
          checkboxes: false,
        }}
        onSelectionChanged={(e) => onSelect(e.api.getSelectedRows()[0] ?? null)}
      />
    </div>
  );
}
