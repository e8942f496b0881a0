import {
  CellStyleModule,
  ClientSideRowModelModule,
  ModuleRegistry,
  RowAutoHeightModule,
  themeQuartz,
  type ColDef,
  type ICellRendererParams,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { useMemo } from "react";
import { Badge } from "~/components/ui";
import type { AuditEntry } from "./use-audit";

// Rows grow to fit their before/after lines, so the auto-height module.
ModuleRegistry.registerModules([
  ClientSideRowModelModule,
  CellStyleModule,
  RowAutoHeightModule,
]);

const theme = themeQuartz.withParams({
  fontFamily: "inherit",
  headerBackgroundColor: "#ece8df",
  accentColor: "#0f5546",
  borderColor: "#dcd6ca",
  fontSize: 14,
  cellHorizontalPaddingScale: 0.7,
});

/** When, in the reader's own time zone (the grid renders in the browser only). */
const when = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
});

function WhenCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return (
    <time dateTime={data.occurred_at} title={data.occurred_at}>
      {when.format(new Date(data.occurred_at))}
    </time>
  );
}

function ChangeCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return (
    <div className="flex flex-col items-start gap-1 py-2 leading-snug">
      <span className="font-semibold">{data.action_label}</span>
      <span className="text-sm text-ink-muted">{data.subject}</span>
    </div>
  );
}

function WhoCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return data.actor.type === "person" ? (
    <span>{data.actor.name}</span>
  ) : (
    <Badge tone={data.actor.type === "gateway" ? "frost" : undefined}>
      {data.actor.name}
    </Badge>
  );
}

function WhereCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  if (!data.site && !data.meter)
    return <span className="text-ink-muted">Organisation</span>;
  return (
    <div className="flex flex-col py-2 leading-snug">
      {data.site ? <span>{data.site.name}</span> : null}
      {data.meter ? (
        <span className="text-sm text-ink-muted">{data.meter.code}</span>
      ) : null}
    </div>
  );
}

/** Each changed field on its line: "Role: Finance → Auditor". */
function ChangesCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  if (data.changes.length === 0)
    return <span className="text-ink-muted">—</span>;
  return (
    <ul className="flex flex-col gap-0.5 py-2 leading-snug">
      {data.changes.map((c) => (
        <li key={c.field}>
          <span className="text-ink-muted">{c.field}:</span>{" "}
          {c.before === "—" ? null : (
            <>
              <del className="decoration-ink-faint">{c.before}</del>
              {" → "}
            </>
          )}
          <strong className="font-semibold">{c.after}</strong>
        </li>
      ))}
    </ul>
  );
}

const defaultColumn: ColDef<AuditEntry> = {
  sortable: false,
  resizable: false,
  wrapText: true,
  autoHeight: true,
  wrapHeaderText: true,
  autoHeaderHeight: true,
};

export function AuditGrid({ entries }: { entries: AuditEntry[] }) {
  const columns = useMemo<ColDef<AuditEntry>[]>(
    () => [
      {
        headerName: "When",
        field: "occurred_at",
        cellRenderer: WhenCell,
        minWidth: 120,
        flex: 1,
      },
      {
        headerName: "Change",
        field: "action_label",
        cellRenderer: ChangeCell,
        minWidth: 180,
        flex: 2,
      },
      {
        headerName: "Who",
        colId: "who",
        valueGetter: (p) => p.data?.actor.name,
        cellRenderer: WhoCell,
        minWidth: 120,
        flex: 1.2,
      },
      {
        headerName: "Where",
        colId: "where",
        valueGetter: (p) => p.data?.site?.name ?? "",
        cellRenderer: WhereCell,
        minWidth: 120,
        flex: 1.2,
      },
      {
        headerName: "Why",
        field: "reason",
        valueFormatter: (p) => p.value ?? "",
        cellClass: "leading-snug py-2",
        minWidth: 140,
        flex: 1.5,
      },
      {
        headerName: "Before → after",
        colId: "changes",
        valueGetter: (p) => p.data?.changes.length ?? 0,
        cellRenderer: ChangesCell,
        minWidth: 220,
        flex: 2.5,
      },
    ],
    [],
  );
  return (
    <AgGridReact<AuditEntry>
      domLayout="autoHeight"
      theme={theme}
      rowData={entries}
      columnDefs={columns}
      defaultColDef={defaultColumn}
      getRowId={(p) => String(p.data.id)}
    />
  );
}
