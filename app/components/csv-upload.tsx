import Papa from "papaparse";
import { useState } from "react";
import { csvRowNumber, missingColumns, rowToReading } from "~/ingest/csv";
import { FigureTable } from "./figure-table";
import { formatCount } from "~/lib/format";
import { Button, Notice } from "./ui";

const CHUNK = 2500;

interface Problem {
  row: number;
  meter?: string;
  reason: string;
}

type State =
  | { step: "idle" }
  | {
      step: "parsed";
      fileName: string;
      headers: string[];
      rows: Record<string, unknown>[];
    }
  | {
      step: "uploading" | "done";
      fileName: string;
      total: number;
      sent: number;
      accepted: number;
      repeats: number;
      problems: Problem[];
      failed?: string;
    };

function Preview({
  headers,
  rows,
}: {
  headers: string[];
  rows: Record<string, unknown>[];
}) {
  return (
    <FigureTable
      bordered
      caption="First rows of the file"
      columns={[
        { label: "Row" },
        ...headers.map((h) => ({ label: h, className: "font-mono" })),
      ]}
    >
      {rows.slice(0, 8).map((r, i) => (
        <tr key={i} className="border-t border-line">
          <td className="px-2 py-1 text-ink-muted">{csvRowNumber(i)}</td>
          {headers.map((h) => (
            <td key={h} className="px-2 py-1 font-mono">
              {r[h] === undefined ? "" : String(r[h])}
            </td>
          ))}
        </tr>
      ))}
    </FigureTable>
  );
}

async function postChunk(orgId: string, readings: Record<string, unknown>[]) {
  const response = await fetch(`/api/v1/orgs/${orgId}/readings`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ readings }),
  });
  const body = await response.json().catch(() => null);
  if (!response.ok)
    throw new Error(
      body?.error?.message ?? `The server answered ${response.status}.`,
    );
  return body as {
    accepted: number;
    repeats: number;
    rejected: { index: number; meter?: string; reason: string }[];
    conflicts: { index: number; meter?: string; reason: string }[];
  };
}

/** Parse in the browser, preview, then send in chunks with a progress bar. */
export function CsvUpload({ orgId }: { orgId: string }) {
  const [state, setState] = useState<State>({ step: "idle" });
  const [parseError, setParseError] = useState<string | null>(null);

  function onFile(file: File | undefined) {
    setParseError(null);
    if (!file) return setState({ step: "idle" });
    Papa.parse<Record<string, string>>(file, {
      header: true,
      skipEmptyLines: "greedy",
      complete: (result) => {
        const headers = result.meta.fields ?? [];
        const missing = missingColumns(headers);
        if (missing.length)
          return setParseError(
            `The file has no ${missing.join(" or ")} column. Use the API's field names as headers.`,
          );
        if (result.data.length === 0)
          return setParseError("The file has a header but no rows.");
        setState({
          step: "parsed",
          fileName: file.name,
          headers,
          rows: result.data.map(rowToReading),
        });
      },
      error: (error) =>
        setParseError(`The file could not be read: ${error.message}`),
    });
  }

  async function upload(rows: Record<string, unknown>[], fileName: string) {
    let progress = {
      step: "uploading" as const,
      fileName,
      total: rows.length,
      sent: 0,
      accepted: 0,
      repeats: 0,
      problems: [] as Problem[],
    };
    setState(progress);
    for (let offset = 0; offset < rows.length; offset += CHUNK) {
      try {
        const result = await postChunk(
          orgId,
          rows.slice(offset, offset + CHUNK),
        );
        const problems = [...result.rejected, ...result.conflicts].map((p) => ({
          row: csvRowNumber(offset + p.index),
          meter: p.meter,
          reason: p.reason,
        }));
        progress = {
          ...progress,
          sent: Math.min(rows.length, offset + CHUNK),
          accepted: progress.accepted + result.accepted,
          repeats: progress.repeats + result.repeats,
          problems: [...progress.problems, ...problems],
        };
        setState(progress);
      } catch (error) {
        setState({
          ...progress,
          step: "done",
          failed: `${(error as Error).message} Rows from ${csvRowNumber(offset)} on were not sent; rows before were stored. Sending the file again is safe: stored rows count as repeats.`,
        });
        return;
      }
    }
    setState({ ...progress, step: "done" });
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <label htmlFor="csv-file" className="font-semibold">
          CSV file of readings
        </label>
        <p id="csv-hint" className="text-sm text-ink-muted">
          Header row with the API's field names, e.g.{" "}
          <code className="break-all">meter,quantity,time,register_kwh</code> or{" "}
          <code className="break-all">
            meter,quantity,start,end,volume_m3,flow_temp_c,return_temp_c,pressure_bar_abs
          </code>
          .
        </p>
        <input
          id="csv-file"
          type="file"
          accept=".csv,text/csv"
          aria-describedby="csv-hint"
          className="rounded-lg border border-line-strong bg-surface p-2"
          onChange={(e) => onFile(e.target.files?.[0])}
        />
      </div>
      {parseError ? <Notice tone="error">{parseError}</Notice> : null}
      {state.step === "parsed" ? (
        <>
          <p>
            <strong>{formatCount(state.rows.length)}</strong> rows in{" "}
            {state.fileName}. First rows:
          </p>
          <Preview headers={state.headers} rows={state.rows} />
          <div>
            <Button onClick={() => void upload(state.rows, state.fileName)}>
              Upload {formatCount(state.rows.length)} readings
            </Button>
          </div>
        </>
      ) : null}
      {state.step === "uploading" || state.step === "done" ? (
        <div className="flex flex-col gap-3">
          <label htmlFor="upload-progress" className="font-semibold">
            {state.step === "done" ? "Finished" : "Uploading"}:{" "}
            {formatCount(state.sent)} of {formatCount(state.total)} rows
          </label>
          <progress
            id="upload-progress"
            max={state.total}
            value={state.sent}
            className="h-3 w-full accent-spruce-700"
          />
          <p role="status">
            {formatCount(state.accepted)} stored · {formatCount(state.repeats)}{" "}
            repeats · {formatCount(state.problems.length)} rows with problems
          </p>
          {state.failed ? <Notice tone="error">{state.failed}</Notice> : null}
          {state.problems.length > 0 ? (
            <FigureTable
              bordered
              maxHeight="max-h-80"
              caption="Rows that were not stored"
              columns={[
                { label: "Row" },
                { label: "Meter" },
                { label: "Problem" },
              ]}
            >
              {state.problems.slice(0, 500).map((p) => (
                <tr
                  key={`${p.row}-${p.reason}`}
                  className="border-t border-line"
                >
                  <td className="px-2 py-1">{p.row}</td>
                  <td className="px-2 py-1 font-mono">{p.meter ?? ""}</td>
                  <td className="px-2 py-1">{p.reason}</td>
                </tr>
              ))}
            </FigureTable>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
