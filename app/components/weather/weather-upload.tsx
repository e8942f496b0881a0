import { useEffect, useRef, useState } from "react";
import { Form, useNavigation } from "react-router";
import {
  MAX_WEATHER_BYTES,
  MAX_WEATHER_ROWS,
  parseWeatherCsv,
  type RowProblem,
  type WeatherParse,
  type WeatherRow,
  type WeatherUploadResult as UploadResult,
} from "~/baselines/weather-csv";
import { FigureTable } from "~/components/figure-table";
import { SiteOptions } from "~/components/options";
import { SectionCard } from "~/components/section-card";
import { Button, Notice, SelectField } from "~/components/ui";
import { formatCount } from "~/lib/format";

function Problems({
  problems,
  count,
}: {
  problems: RowProblem[];
  count: number;
}) {
  return (
    <FigureTable
      bordered
      maxHeight="max-h-72"
      captionVisible
      caption={
        <>
          {formatCount(count)} rows with problems
          {count > problems.length
            ? ` (the first ${problems.length} listed)`
            : ""}
          ; nothing was stored
        </>
      }
      columns={[{ label: "Row" }, { label: "Problem" }]}
    >
      {problems.map((p) => (
        <tr key={`${p.row}-${p.message}`} className="border-t border-line">
          <td className="px-2 py-1 tabular-nums">{p.row}</td>
          <td className="px-2 py-1">{p.message}</td>
        </tr>
      ))}
    </FigureTable>
  );
}

function Preview({ rows }: { rows: WeatherRow[] }) {
  return (
    <FigureTable
      bordered
      caption="First rows of the file"
      columns={[
        { label: "Row" },
        { label: "date", className: "font-mono" },
        { label: "mean_temp_c", align: "right", className: "font-mono" },
      ]}
    >
      {rows.slice(0, 6).map((r, i) => (
        <tr key={r.day} className="border-t border-line">
          <td className="px-2 py-1 text-ink-muted">{i + 2}</td>
          <td className="px-2 py-1 font-mono">{r.day}</td>
          <td className="px-2 py-1 text-right font-mono tabular-nums">
            {r.meanTempC.toFixed(2)}
          </td>
        </tr>
      ))}
    </FigureTable>
  );
}

/**
 * A weather file for one site: checked in the browser for a preview, then
 * posted as a file; the server checks it again and stores all rows or none.
 */
export function WeatherUpload({
  sites,
  siteId,
  result,
}: {
  sites: { id: string; name: string }[];
  siteId: string;
  result: UploadResult | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const form = useRef<HTMLFormElement>(null);
  // A check belongs to the answer it was made after: a new answer from the
  // server replaces it.
  const [checked, setChecked] = useState<{
    check: WeatherParse & { name: string };
    after: UploadResult | undefined;
  } | null>(null);
  const check = checked && checked.after === result ? checked.check : null;
  useEffect(() => {
    if (result?.message) form.current?.reset();
  }, [result]);

  async function onFile(file: File | undefined) {
    if (!file) return setChecked(null);
    const check: WeatherParse & { name: string } =
      file.size > MAX_WEATHER_BYTES
        ? {
            ok: false,
            name: file.name,
            file: `The file has ${formatCount(file.size)} bytes; send at most ${formatCount(MAX_WEATHER_BYTES)}.`,
            problems: [],
            problemCount: 0,
          }
        : { ...parseWeatherCsv(await file.text()), name: file.name };
    setChecked({ check, after: result });
  }

  const errors = result?.errors ?? {};
  const serverProblems =
    result?.problems && result.problems.length > 0 ? result : null;
  return (
    <Form
      method="post"
      encType="multipart/form-data"
      ref={form}
      noValidate
      aria-label="Upload weather"
      className="flex flex-col gap-4"
    >
      <input type="hidden" name="intent" value="upload-weather" />
      {result?.message ? (
        <Notice tone="success">{result.message}</Notice>
      ) : null}
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField
          label="Site"
          name="siteId"
          defaultValue={siteId}
          error={errors.siteId}
        >
          <SiteOptions sites={sites} />
        </SelectField>
        <div className="flex flex-col gap-1">
          <label htmlFor="weather-file" className="font-semibold">
            CSV file of daily mean temperatures
          </label>
          <p id="weather-hint" className="text-sm text-ink-muted">
            Header <code>date,mean_temp_c</code>; one row per site-local day,
            like <code>2026-01-31,4.5</code>. At most{" "}
            {formatCount(MAX_WEATHER_ROWS)} rows and 1 MB. Days already stored
            take the new value.
          </p>
          <input
            id="weather-file"
            name="file"
            type="file"
            accept=".csv,text/csv"
            required
            aria-describedby="weather-hint"
            aria-invalid={errors.file ? true : undefined}
            className="rounded-lg border border-line-strong bg-surface p-2"
            onChange={(e) => void onFile(e.target.files?.[0])}
          />
          {errors.file ? (
            <p className="text-sm font-semibold text-danger-700">
              {errors.file}
            </p>
          ) : null}
        </div>
      </div>
      {check && !check.ok && check.file ? (
        <Notice tone="error">{check.file}</Notice>
      ) : null}
      {check && !check.ok && check.problems.length > 0 ? (
        <Problems problems={check.problems} count={check.problemCount} />
      ) : null}
      {check?.ok ? (
        <>
          <p>
            <strong>{formatCount(check.rows.length)}</strong> days in{" "}
            {check.name}, from {check.rows[0].day} to {check.rows.at(-1)!.day}.
            First rows:
          </p>
          <Preview rows={check.rows} />
        </>
      ) : null}
      {serverProblems ? (
        <Problems
          problems={serverProblems.problems!}
          count={serverProblems.problemCount ?? serverProblems.problems!.length}
        />
      ) : null}
      <div>
        <Button type="submit" disabled={busy || (check !== null && !check.ok)}>
          {busy ? "Uploading…" : "Upload weather"}
        </Button>
      </div>
    </Form>
  );
}

/** The upload section of the page, for those who may upload. */
export function WeatherUploadCard(props: Parameters<typeof WeatherUpload>[0]) {
  return (
    <SectionCard headingId="upload-heading" title="Upload weather">
      <p className="mt-1 text-ink-muted">
        Daily mean outdoor temperature, °C, for the days of the site's own
        calendar. The whole file is checked first: if any row is wrong, nothing
        is stored.
      </p>
      <div className="mt-4">
        <WeatherUpload key={props.siteId} {...props} />
      </div>
    </SectionCard>
  );
}
