import {
  ClientSideRowModelModule,
  ModuleRegistry,
  RowAutoHeightModule,
  type ColDef,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { useMemo } from "react";
import { gridTheme } from "~/components/grid-theme";
import { calendarDay, formatCost } from "~/lib/format";
import { carrierLabels, type carriers } from "~/sites/meter-kinds";
import type { Tariff } from "~/tariffs/tariff-schema";

ModuleRegistry.registerModules([ClientSideRowModelModule, RowAutoHeightModule]);

interface VersionRow {
  id: string;
  supply: string;
  tariff: string;
  validFrom: string;
  validTo: string | null;
  bands: string;
  standing: string;
  maxDemand: string;
  levies: string;
  exportRate: string;
  vat: string;
}

/** One row per version: what a supply paid from when to when, in plain words. */
function rowsOf(tariffs: readonly Tariff[]): VersionRow[] {
  return tariffs.flatMap((t) =>
    t.versions.map((v) => {
      const money = (amount: string) => formatCost(amount, t.currency);
      const r = v.rates;
      return {
        id: v.id,
        supply: `${t.site_name} · ${carrierLabels[t.carrier as (typeof carriers)[number]]}${t.meter_code ? ` · ${t.meter_code}` : ""}`,
        tariff: t.name,
        validFrom: v.valid_from,
        validTo: v.valid_to,
        bands: r.bands
          .map((b) => `${b.name} ${b.rate_per_kwh}/kWh (${b.windows})`)
          .join("; "),
        standing:
          `${money(r.standing_charge_per_day)}/day` +
          (Number(r.capacity_charge_per_day) > 0
            ? ` + capacity ${money(r.capacity_charge_per_day)}/day`
            : ""),
        maxDemand:
          Number(r.max_demand_rate_per_kw_month) > 0
            ? `${r.max_demand_rate_per_kw_month}/kW a month`
            : "—",
        levies: r.levies.length
          ? r.levies.map((l) => `${l.name} ${l.rate_per_kwh}/kWh`).join("; ")
          : "—",
        exportRate: r.export_rate_per_kwh
          ? `${r.export_rate_per_kwh}/kWh`
          : "Not credited",
        vat: `${r.vat_percent} %`,
      };
    }),
  );
}

export function TariffVersionsGrid({
  tariffs,
}: {
  tariffs: readonly Tariff[];
}) {
  const rows = useMemo(() => rowsOf(tariffs), [tariffs]);
  const columns = useMemo<ColDef<VersionRow>[]>(
    () => [
      { headerName: "Supply", field: "supply", minWidth: 200, flex: 1.4 },
      {
        headerName: "Tariff",
        field: "tariff",
        minWidth: 180,
        flex: 1.3,
        wrapText: true,
        autoHeight: true,
      },
      {
        headerName: "From",
        field: "validFrom",
        valueFormatter: (p) => calendarDay(p.value),
        minWidth: 110,
      },
      {
        headerName: "To",
        field: "validTo",
        valueFormatter: (p) =>
          p.value ? calendarDay(p.value) : "until changed",
        minWidth: 120,
      },
      {
        headerName: "Unit rates by time band",
        field: "bands",
        minWidth: 260,
        flex: 2,
        wrapText: true,
        autoHeight: true,
      },
      {
        headerName: "Standing",
        field: "standing",
        minWidth: 140,
        flex: 1,
        wrapText: true,
        autoHeight: true,
      },
      { headerName: "Maximum demand", field: "maxDemand", minWidth: 130 },
      {
        headerName: "Levies",
        field: "levies",
        minWidth: 150,
        flex: 1,
        wrapText: true,
        autoHeight: true,
      },
      { headerName: "Export", field: "exportRate", minWidth: 110 },
      { headerName: "VAT", field: "vat", minWidth: 70 },
    ],
    [],
  );
  return (
    <div className="w-full" data-testid="tariff-versions">
      <AgGridReact<VersionRow>
        domLayout="autoHeight"
        theme={gridTheme}
        rowData={rows}
        columnDefs={columns}
        getRowId={(p) => p.data.id}
      />
    </div>
  );
}
