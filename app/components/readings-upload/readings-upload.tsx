/**
 * The Readings page's upload, in steps: choose a file (CSV or XLSX); for a
 * supplier's file, map its columns and check the preview; then send it in
 * chunks with a progress bar. A CSV already in the API's field names skips
 * the mapping. Everything is read in the browser; the server sees only
 * readings, through the same API and checks as a gateway's.
 */
import { useState } from "react";
import { isRegisterQuantity } from "~/ingest/reading-schema";
import type { UploadTally } from "~/ingest/upload-tally";
import { Button, Notice } from "../ui";
import { ApiFieldsPreview } from "./api-fields-preview";
import { loadFile, type LoadedFile } from "./load-file";
import { sendReadings, type ReadingsToSend } from "./send-readings";
import { SupplierFileStep } from "./supplier-file-step";
import { TemplatesCard } from "./templates-card";
import type { PageMeter } from "./upload-meter";
import { UploadProgress } from "./upload-progress";

type Sending = { tally: UploadTally; finished: boolean; failed?: string };

export function ReadingsUpload({
  orgId,
  meters,
}: {
  orgId: string;
  meters: readonly PageMeter[];
}) {
  const [file, setFile] = useState<LoadedFile | "reading" | null>(null);
  const [sending, setSending] = useState<Sending | null>(null);
  const [inputKey, setInputKey] = useState(0);

  async function choose(chosen: File | undefined) {
    setSending(null);
    if (!chosen) return setFile(null);
    setFile("reading");
    setFile(await loadFile(chosen));
  }

  async function send({ readings, readingRows }: ReadingsToSend) {
    const result = await sendReadings({
      orgId,
      readings,
      readingRows,
      onTally: (tally) => setSending({ tally, finished: false }),
    });
    setSending({ tally: result.tally, finished: true, failed: result.failed });
  }

  function startAgain() {
    setFile(null);
    setSending(null);
    setInputKey((k) => k + 1);
  }

  // The interval templates' example rows use two of the organisation's own meters.
  const codes = meters
    .filter((m) => !isRegisterQuantity(m.quantity))
    .map((m) => m.code);
  return (
    <div className="flex flex-col gap-4">
      <TemplatesCard
        meterCodes={codes.length >= 2 ? [codes[0], codes[1]] : undefined}
      />
      <div className="flex flex-col gap-1">
        <label htmlFor="readings-file" className="font-semibold">
          File of readings (CSV or Excel .xlsx)
        </label>
        <p id="readings-file-hint" className="text-sm text-ink-muted">
          A supplier&apos;s file of kWh per interval, or a CSV with the
          API&apos;s field names as headers (see the templates above).
        </p>
        <input
          key={inputKey}
          id="readings-file"
          type="file"
          accept=".csv,text/csv,.xlsx,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
          aria-describedby="readings-file-hint"
          disabled={sending !== null && !sending.finished}
          className="rounded-lg border border-line-strong bg-surface p-2"
          onChange={(e) => void choose(e.target.files?.[0])}
        />
      </div>
      {file === "reading" ? (
        <p role="status">
          Reading the file… a year of data for many meters takes some seconds.
        </p>
      ) : null}
      {file !== null && file !== "reading" && file.kind === "error" ? (
        <Notice tone="error">{file.message}</Notice>
      ) : null}
      {sending === null &&
      file !== null &&
      file !== "reading" &&
      file.kind === "supplier" ? (
        <SupplierFileStep
          fileName={file.fileName}
          table={file.table}
          meters={meters}
          onSend={(s) => void send(s)}
        />
      ) : null}
      {sending === null &&
      file !== null &&
      file !== "reading" &&
      file.kind === "api-fields" ? (
        <ApiFieldsPreview
          fileName={file.fileName}
          header={file.header}
          readings={file.readings}
          readingRows={file.readingRows}
          onSend={() => void send(file)}
        />
      ) : null}
      {sending !== null ? (
        <>
          <UploadProgress {...sending} />
          {sending.finished ? (
            <div>
              <Button type="button" variant="secondary" onClick={startAgain}>
                Upload another file
              </Button>
            </div>
          ) : null}
        </>
      ) : null}
    </div>
  );
}
