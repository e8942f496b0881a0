import { formatCount } from "~/lib/format";
import { FigureTable } from "../figure-table";
import { Button } from "../ui";

/** A file in the API's own field names: its first rows as they will be sent. */
export function ApiFieldsPreview({
  fileName,
  header,
  readings,
  readingRows,
  onSend,
}: {
  fileName: string;
  header: string[];
  readings: Record<string, unknown>[];
  readingRows: number[];
  onSend: () => void;
}) {
  return (
    <div className="flex flex-col gap-3">
      <p data-testid="readings-count">
        <strong>{formatCount(readings.length)}</strong> rows in {fileName}, in
        the API&apos;s field names; the server checks each as it arrives.
      </p>
      <FigureTable
        bordered
        caption="First rows of the file"
        columns={[
          { label: "Row" },
          ...header.map((h) => ({ label: h, className: "font-mono" })),
        ]}
      >
        {readings.slice(0, 8).map((r, i) => (
          <tr key={i} className="border-t border-line">
            <td className="px-2 py-1 text-ink-muted">{readingRows[i]}</td>
            {header.map((h) => (
              <td key={h} className="px-2 py-1 font-mono">
                {r[h] === undefined ? "" : String(r[h])}
              </td>
            ))}
          </tr>
        ))}
      </FigureTable>
      <div>
        <Button type="button" onClick={onSend}>
          Upload {formatCount(readings.length)} readings
        </Button>
      </div>
    </div>
  );
}
