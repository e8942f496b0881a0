import type { UploadTally } from "~/ingest/upload-tally";
import { formatCount } from "~/lib/format";
import { FigureTable } from "../figure-table";
import { Notice } from "../ui";

/** The progress bar while chunks go out, then the counts: accepted, already stored, refused. */
export function UploadProgress({
  tally,
  finished,
  failed,
}: {
  tally: UploadTally;
  finished: boolean;
  failed?: string;
}) {
  return (
    <div className="flex flex-col gap-3">
      <label htmlFor="upload-progress" className="font-semibold">
        {finished ? "Finished" : "Uploading"}: {formatCount(tally.sent)} of{" "}
        {formatCount(tally.total)} readings sent
      </label>
      <progress
        id="upload-progress"
        max={Math.max(tally.total, 1)}
        value={tally.sent}
        className="h-3 w-full accent-spruce-700"
      />
      <p role="status" data-testid="upload-counts">
        {formatCount(tally.accepted)} accepted ·{" "}
        {formatCount(tally.alreadyStored)} already stored ·{" "}
        {formatCount(tally.refused.length)} refused
      </p>
      {finished && tally.alreadyStored > 0 && tally.accepted === 0 ? (
        <Notice>
          Every reading in the file was already stored: nothing changed.
        </Notice>
      ) : null}
      {failed ? <Notice tone="error">{failed}</Notice> : null}
      {tally.refused.length > 0 ? (
        <FigureTable
          bordered
          maxHeight="max-h-80"
          caption="Readings the server refused"
          columns={[{ label: "Row" }, { label: "Meter" }, { label: "Reason" }]}
        >
          {tally.refused.slice(0, 500).map((p, i) => (
            <tr key={i} className="border-t border-line">
              <td className="px-2 py-1">{p.row}</td>
              <td className="px-2 py-1 font-mono">{p.meter ?? ""}</td>
              <td className="px-2 py-1">{p.reason}</td>
            </tr>
          ))}
        </FigureTable>
      ) : null}
    </div>
  );
}
