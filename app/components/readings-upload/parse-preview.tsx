import type { FitResult } from "~/ingest/supplier-files/fit-to-meters";
import { formatCount } from "~/lib/format";
import { FigureTable } from "../figure-table";
import { Notice } from "../ui";

/** How many refusals the table lists; all are counted. */
const ERRORS_SHOWN = 200;

/** The parse's outcome before anything is sent: the count, the notes, and each refusal by row, column and reason. */
export function ParsePreview({ fit }: { fit: FitResult }) {
  return (
    <div className="flex flex-col gap-3">
      <p data-testid="readings-count">
        <strong>{formatCount(fit.readings.length)}</strong> readings of kWh per
        interval ready
        {fit.errorCount > 0 ? (
          <>
            {" "}
            · <strong>{formatCount(fit.errorCount)}</strong>{" "}
            {fit.errorCount === 1 ? "problem" : "problems"}
          </>
        ) : null}
      </p>
      {fit.notes.length > 0 ? (
        <Notice title="How the file was read">
          <ul className="list-disc pl-5">
            {fit.notes.slice(0, 20).map((note, i) => (
              <li key={i}>{note}</li>
            ))}
          </ul>
          {fit.notes.length > 20 ? (
            <p>…and {formatCount(fit.notes.length - 20)} more.</p>
          ) : null}
        </Notice>
      ) : null}
      {fit.errors.length > 0 ? (
        <FigureTable
          bordered
          maxHeight="max-h-80"
          caption="Problems in the file"
          captionVisible
          columns={[{ label: "Row" }, { label: "Column" }, { label: "Reason" }]}
        >
          {fit.errors.slice(0, ERRORS_SHOWN).map((e, i) => (
            <tr key={i} className="border-t border-line">
              <td className="px-2 py-1">{e.row}</td>
              <td className="px-2 py-1 font-mono">{e.column}</td>
              <td className="px-2 py-1">{e.message}</td>
            </tr>
          ))}
        </FigureTable>
      ) : null}
      {fit.errorCount > ERRORS_SHOWN ? (
        <p className="text-sm text-ink-muted">
          The first {ERRORS_SHOWN} of {formatCount(fit.errorCount)} problems are
          listed.
        </p>
      ) : null}
    </div>
  );
}
