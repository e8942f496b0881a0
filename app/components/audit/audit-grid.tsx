import {
  CellStyleModule,
  ClientSideRowModelModule,
  ModuleRegistry,
  RowAutoHeightModule,
  type ColDef,
  type ICellRendererParams,
} from "ag-grid-community";
import { AgGridReact } from "ag-grid-react";
import { gridTheme } from "~/components/grid-theme";
import { useMemo, type ReactNode } from "react";
import { Badge } from "~/components/ui";
import { dateTimeIn } from "~/lib/format";
import type { AuditEntry } from "./use-audit";

// Rows grow to fit their before/after lines, so the auto-height module.
ModuleRegistry.registerModules([
  ClientSideRowModelModule,
  CellStyleModule,
  RowAutoHeightModule,
]);

/**
 * Cells hold several short lines: each renderer pads its own content, as
 * auto-height rows are measured from the content, not the cell.
 */
function Lines({ children }: { children: ReactNode }) {
  return <div className="py-2 leading-snug">{children}</div>;
}

function WhenCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return (
    <Lines>
      <time dateTime={data.occurred_at} title={data.occurred_at}>
        {/* The reader's own zone: the grid renders in the browser only. */}
        {dateTimeIn(data.occurred_at)}
      </time>
    </Lines>
  );
}

function ReasonCell({ data }: ICellRendererParams<AuditEntry>) {
  return data?.reason ? <Lines>{data.reason}</Lines> : null;
}

function ChangeCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return (
    <div className="flex flex-col items-start gap-0.5 py-2 leading-snug">
      <span className="font-semibold">{data.action_label}</span>
      <span className="text-sm text-ink-muted">{data.subject}</span>
    </div>
  );
}

function WhoCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  return (
    <Lines>
      {data.actor.type === "person" ? (
        data.actor.name
      ) : (
        <Badge tone={data.actor.type === "system" ? undefined : "frost"}>
          {data.actor.name}
        </Badge>
      )}
    </Lines>
  );
}

function WhereCell({ data }: ICellRendererParams<AuditEntry>) {
  if (!data) return null;
  if (!data.site && !data.meter)
    return (
      <Lines>
        <span className="text-ink-muted">Organisation</span>
      </Lines>
    );
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
    return (
      <Lines>
        <span className="text-ink-muted">—</span>
      </Lines>
    );
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
        cellRenderer: ReasonCell,
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
      theme={gridTheme}
      rowData={entries}
      columnDefs={columns}
      defaultColDef={defaultColumn}
      getRowId={(p) => String(p.data.id)}
    />
  );
}
