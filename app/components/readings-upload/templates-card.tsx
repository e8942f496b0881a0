import type { ReactNode } from "react";
import {
  apiFieldTemplate,
  apiFieldTemplateName,
  UPLOAD_QUANTITIES,
} from "~/ingest/upload-quantities";
import {
  csvTemplate,
  templateFileName,
  type TemplateOptions,
} from "~/ingest/supplier-files/templates";
import { Button } from "../ui";

/** Offers text as a file: a Blob and a temporary link, all in the browser. */
function download(fileName: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: "text/csv" }));
  const link = document.createElement("a");
  link.href = url;
  link.download = fileName;
  link.click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function TemplateButton({
  fileName,
  text,
  children,
}: {
  fileName: string;
  text: () => string;
  children: ReactNode;
}) {
  return (
    <Button
      type="button"
      variant="secondary"
      onClick={() => download(fileName, text())}
    >
      {children}
    </Button>
  );
}

const INTERVAL_TEMPLATES: { options: TemplateOptions; label: string }[] = [
  {
    options: { layout: "wide", intervalMinutes: 60 },
    label: "one row per day, 24 hours",
  },
  {
    options: { layout: "wide", intervalMinutes: 30 },
    label: "one row per day, 48 half-hours",
  },
  {
    options: { layout: "long", intervalMinutes: 60 },
    label: "one row per hour",
  },
];

/** The allowed quantities in plain words, each with its template to download. */
export function TemplatesCard({
  meterCodes,
}: {
  meterCodes?: readonly [string, string];
}) {
  return (
    <details className="rounded-lg border border-line p-4">
      <summary className="cursor-pointer font-semibold">
        What a file can hold, and templates
      </summary>
      <dl className="mt-3 flex flex-col gap-3">
        <div>
          <dt className="font-semibold">
            kWh per interval (any meter that is not a register)
          </dt>
          <dd className="text-ink-muted">
            The energy in each interval, as a supplier&apos;s file gives it: one
            row per interval, or one row per day with a column per hour,
            half-hour or quarter-hour. Always a positive amount; an export
            meter&apos;s is stored as exported.
          </dd>
          <dd className="mt-2 flex flex-wrap gap-2">
            {INTERVAL_TEMPLATES.map(({ options, label }) => (
              <TemplateButton
                key={label}
                fileName={templateFileName(options)}
                text={() => csvTemplate({ ...options, meterCodes })}
              >
                Template: {label}
              </TemplateButton>
            ))}
          </dd>
        </div>
        {UPLOAD_QUANTITIES.map((q) => (
          <div key={q.quantity}>
            <dt className="font-semibold">{q.label}</dt>
            <dd className="text-ink-muted">
              {q.words} Headers:{" "}
              <code className="break-all">{q.header.join(",")}</code>
            </dd>
            <dd className="mt-2">
              <TemplateButton
                fileName={apiFieldTemplateName(q.quantity)}
                text={() => apiFieldTemplate(q.quantity)}
              >
                Template: {q.label.split(" (")[0].toLowerCase()}
              </TemplateButton>
            </dd>
          </div>
        ))}
      </dl>
    </details>
  );
}
