import { useMemo, useState } from "react";
import { columnLabel } from "~/ingest/supplier-files/columns";
import { clockChangeNotes } from "~/ingest/supplier-files/clock-change-days";
import {
  fitToMeters,
  goodRowsOnly,
  type FitResult,
} from "~/ingest/supplier-files/fit-to-meters";
import { parseSupplierFile } from "~/ingest/supplier-files/parse-supplier-file";
import type { Table } from "~/ingest/supplier-files/types";
import { formatCount } from "~/lib/format";
import { Button, Notice } from "../ui";
import { initialMapping } from "./mapping-defaults";
import { MappingStep, type MappingChoice } from "./mapping-step";
import { ParsePreview } from "./parse-preview";
import type { ReadingsToSend } from "./send-readings";
import type { PageMeter } from "./upload-meter";

/** More refusals than this and the mapping is wrong, not the rows: the list stops, the count goes on. */
const MAX_ERRORS = 20_000;

function columnsOf(choice: MappingChoice, header: readonly string[]) {
  const { mapping } = choice;
  const meterColumn =
    "column" in mapping.meter
      ? columnLabel(header, mapping.meter.column)
      : "meter";
  const valueColumn =
    mapping.layout === "long"
      ? columnLabel(header, mapping.energy.column)
      : `${columnLabel(header, mapping.intervals.firstColumn)}–${columnLabel(header, mapping.intervals.firstColumn + mapping.intervals.count - 1)}`;
  return { meterColumn, valueColumn };
}

function readTable(
  table: Table,
  choice: MappingChoice,
  meters: readonly PageMeter[],
): FitResult {
  const parsed = parseSupplierFile(table, choice.mapping, {
    timeZone: choice.timeZone,
    dateOrder: choice.dateOrder || undefined,
    maxErrors: MAX_ERRORS,
  });
  const fit = fitToMeters(parsed, meters, columnsOf(choice, table.header));
  if (parsed.readings.length === 0) return fit;
  // The parser writes every instant with toISOString, so text order is time
  // order: comparing text spares 876,000 Date.parse calls on a year's file.
  let first = parsed.readings[0].start;
  let last = first;
  for (const r of parsed.readings) {
    if (r.start < first) first = r.start;
    if (r.start > last) last = r.start;
  }
  const fileMinutes =
    (Date.parse(parsed.readings[0].end) -
      Date.parse(parsed.readings[0].start)) /
    60_000;
  return {
    ...fit,
    notes: [
      ...clockChangeNotes(
        Date.parse(first),
        Date.parse(last),
        choice.timeZone,
        fileMinutes,
      ),
      ...fit.notes,
    ],
  };
}

function firstMeterCode(
  table: Table,
  choice: MappingChoice,
): string | undefined {
  const { meter } = choice.mapping;
  if ("code" in meter) return meter.code;
  const cell = table.rows[0]?.cells[meter.column];
  return cell === null || cell === undefined ? undefined : String(cell).trim();
}

/** A supplier's file: map its columns, see what would be stored and what is refused, then send. */
export function SupplierFileStep({
  fileName,
  table,
  meters,
  onSend,
}: {
  fileName: string;
  table: Table;
  meters: readonly PageMeter[];
  onSend: (send: ReadingsToSend) => void;
}) {
  const timeZones = [...new Set(meters.map((m) => m.timeZone))].sort();
  const [choice, setChoice] = useState<MappingChoice>(() => {
    const fallback = meters[0];
    const mapping = initialMapping(
      table.header,
      fallback?.code ?? "",
      fallback?.intervalMinutes ?? 60,
    );
    const start = {
      mapping,
      dateOrder: "" as const,
      timeZone: fallback?.timeZone ?? "UTC",
    };
    const code = firstMeterCode(table, start);
    const zone = meters.find((m) => m.code === code)?.timeZone;
    return zone ? { ...start, timeZone: zone } : start;
  });
  const fit = useMemo(
    () => readTable(table, choice, meters),
    [table, choice, meters],
  );
  const complete = fit.errorCount === fit.errors.length;
  const good = useMemo(
    () => (fit.errorCount > 0 && complete ? goodRowsOnly(fit) : null),
    [fit, complete],
  );

  return (
    <div className="flex flex-col gap-4">
      <p>
        <strong>{fileName}</strong>: {formatCount(table.rows.length)} rows under
        the header (row {table.headerRowNumber}).
      </p>
      <MappingStep
        header={table.header}
        meters={meters}
        timeZones={timeZones}
        choice={choice}
        onChange={setChoice}
      />
      <ParsePreview fit={fit} />
      {fit.errorCount === 0 ? (
        <div>
          <Button
            type="button"
            disabled={fit.readings.length === 0}
            onClick={() => onSend(fit)}
          >
            Upload {formatCount(fit.readings.length)} readings
          </Button>
        </div>
      ) : (
        <Notice
          tone="caution"
          title="Nothing is sent while the file has problems"
        >
          <p>
            Correct the file or the mapping above, or store only the rows
            without problems: the rows listed are then left out.
          </p>
          {good !== null ? (
            <Button
              type="button"
              variant="secondary"
              className="mt-2"
              disabled={good.readings.length === 0}
              onClick={() => onSend(good)}
            >
              Store the good rows only ({formatCount(good.readings.length)}{" "}
              readings)
            </Button>
          ) : (
            <p className="mt-1">
              Too many problems to pick out the good rows: check the mapping.
            </p>
          )}
        </Notice>
      )}
    </div>
  );
}
