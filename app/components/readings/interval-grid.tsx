import {
  ClientSideRowModelModule,
  CellStyleModule,
  ModuleRegistry,
  NumberFilterModule,
  PaginationModule,
  RowSelectionModule,
  TextFilterModule,
  themeQuartz,
  type ColDef,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { useMemo } from "react";
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

const theme = themeQuartz.withParams({
  fontFamily: "inherit",
  headerBackgroundColor: "#ece8df",
  accentColor: "#0f5546",
  borderColor: "#dcd6ca",
  fontSize: 14,
});

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
  const format = useMemo(
    () =>
      new Intl.DateTimeFormat("en-GB", {
        timeZone,
        dateStyle: "medium",
        timeStyle: "short",
      }),
    [timeZone],
  );
  const columns = useMemo<ColDef<Interval>[]>(
    () => [
      {
        headerName: `Hour (${timeZone})`,
        field: "hour_start",
        valueFormatter: (p) => format.format(new Date(p.value)),
        flex: 2,
        sort: "desc",
      },
      {
        headerName: "Energy (kWh)",
        field: "energy_kwh",
        type: "numericColumn",
        valueGetter: (p) => Number(p.data?.energy_kwh),
        valueFormatter: (p) =>
          Number(p.value).toLocaleString("en-GB", { maximumFractionDigits: 3 }),
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
    ],
    [format, timeZone],
  );
  return (
    <div style={{ height: 420 }}>
      <AgGridReact<Interval>
        theme={theme}
        rowData={intervals}
        columnDefs={columns}
        getRowId={(p) => p.data.hour_start}
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
