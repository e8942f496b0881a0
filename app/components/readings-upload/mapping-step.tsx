import type { DateOrder } from "~/ingest/supplier-files/date-text";
import { columnLetter } from "~/ingest/supplier-files/columns";
import type { SupplierFileMapping } from "~/ingest/supplier-files/parse-supplier-file";
import type { MeterSource } from "~/ingest/supplier-files/layout-common";
import { SelectField } from "../ui";
import { mappingFor, type Layout } from "./mapping-defaults";
import type { PageMeter } from "./upload-meter";

export interface MappingChoice {
  mapping: SupplierFileMapping;
  /** "" lets the parser find the order from the file. */
  dateOrder: DateOrder | "";
  timeZone: string;
}

const DATE_FORMATS: { value: DateOrder | ""; label: string }[] = [
  { value: "", label: "Found from the file" },
  { value: "ymd", label: "ISO 8601 or yyyy-mm-dd hh:mm" },
  { value: "dmy", label: "dd/mm/yyyy hh:mm" },
  { value: "mdy", label: "mm/dd/yyyy hh:mm (US)" },
];

const DAY_COLUMN_COUNTS: { count: number; label: string }[] = [
  { count: 24, label: "24 hours" },
  { count: 25, label: "25 hours (room for the day the clocks go back)" },
  { count: 48, label: "48 half-hours" },
  { count: 50, label: "50 half-hours (room for the day the clocks go back)" },
  { count: 96, label: "96 quarter-hours" },
  {
    count: 100,
    label: "100 quarter-hours (room for the day the clocks go back)",
  },
];

function ColumnSelect({
  label,
  header,
  value,
  onChange,
}: {
  label: string;
  header: readonly string[];
  value: number;
  onChange: (column: number) => void;
}) {
  return (
    <SelectField
      label={label}
      value={value}
      onChange={(e) => onChange(Number(e.target.value))}
    >
      {header.map((h, i) => (
        <option key={i} value={i}>
          {columnLetter(i)}: {h || "(no heading)"}
        </option>
      ))}
    </SelectField>
  );
}

const meterValue = (source: MeterSource) =>
  "column" in source ? `column:${source.column}` : `meter:${source.code}`;

function MeterSelect({
  header,
  meters,
  value,
  onChange,
}: {
  header: readonly string[];
  meters: readonly PageMeter[];
  value: MeterSource;
  onChange: (source: MeterSource) => void;
}) {
  return (
    <SelectField
      label="Meter"
      value={meterValue(value)}
      onChange={(e) => {
        const [kind, rest] = [
          e.target.value.slice(0, e.target.value.indexOf(":")),
          e.target.value.slice(e.target.value.indexOf(":") + 1),
        ];
        onChange(kind === "column" ? { column: Number(rest) } : { code: rest });
      }}
    >
      <optgroup label="A column of meter codes">
        {header.map((h, i) => (
          <option key={i} value={`column:${i}`}>
            Column {columnLetter(i)}: {h || "(no heading)"}
          </option>
        ))}
      </optgroup>
      <optgroup label="One meter for the whole file">
        {meters.map((m) => (
          <option key={m.id} value={`meter:${m.code}`}>
            {m.code} · {m.name} ({m.siteName})
          </option>
        ))}
      </optgroup>
    </SelectField>
  );
}

/** Which column is what, the layout, the date format and the clock the file's times are read in. */
export function MappingStep({
  header,
  meters,
  timeZones,
  choice,
  onChange,
}: {
  header: readonly string[];
  meters: readonly PageMeter[];
  timeZones: readonly string[];
  choice: MappingChoice;
  onChange: (choice: MappingChoice) => void;
}) {
  const { mapping } = choice;
  const setMapping = (next: SupplierFileMapping) =>
    onChange({ ...choice, mapping: next });
  const meterMinutes =
    meters.find((m) => "code" in mapping.meter && m.code === mapping.meter.code)
      ?.intervalMinutes ?? 60;
  return (
    <fieldset className="grid gap-4 rounded-lg border border-line p-4 md:grid-cols-2">
      <legend className="px-1 font-semibold">What the file holds</legend>
      <SelectField
        label="Layout"
        value={mapping.layout}
        onChange={(e) =>
          setMapping(
            mappingFor(
              e.target.value as Layout,
              header,
              mapping.meter,
              meterMinutes,
            ),
          )
        }
      >
        <option value="long">One row per interval</option>
        <option value="wide">One row per day, a column per interval</option>
      </SelectField>
      <MeterSelect
        header={header}
        meters={meters}
        value={mapping.meter}
        onChange={(meter) => {
          const zone = meters.find(
            (m) => "code" in meter && m.code === meter.code,
          )?.timeZone;
          onChange({
            ...choice,
            mapping: { ...mapping, meter },
            timeZone: zone ?? choice.timeZone,
          });
        }}
      />
      {mapping.layout === "wide" ? (
        <>
          <ColumnSelect
            label="Date column"
            header={header}
            value={mapping.date.column}
            onChange={(column) => setMapping({ ...mapping, date: { column } })}
          />
          <ColumnSelect
            label="First interval column"
            header={header}
            value={mapping.intervals.firstColumn}
            onChange={(firstColumn) =>
              setMapping({
                ...mapping,
                intervals: { ...mapping.intervals, firstColumn },
              })
            }
          />
          <SelectField
            label="Interval columns per day"
            value={mapping.intervals.count}
            onChange={(e) =>
              setMapping({
                ...mapping,
                intervals: {
                  ...mapping.intervals,
                  count: Number(e.target.value),
                },
              })
            }
          >
            {DAY_COLUMN_COUNTS.map(({ count, label }) => (
              <option key={count} value={count}>
                {label}
              </option>
            ))}
          </SelectField>
        </>
      ) : (
        <>
          <ColumnSelect
            label="Time column"
            header={header}
            value={mapping.time.column}
            onChange={(column) =>
              setMapping({ ...mapping, time: { ...mapping.time, column } })
            }
          />
          <SelectField
            label="The time marks"
            value={mapping.time.marks}
            onChange={(e) =>
              setMapping({
                ...mapping,
                time: {
                  ...mapping.time,
                  marks: e.target.value as "start" | "end",
                },
              })
            }
          >
            <option value="start">the start of the interval</option>
            <option value="end">the end of the interval</option>
          </SelectField>
          <ColumnSelect
            label="kWh column"
            header={header}
            value={mapping.energy.column}
            onChange={(column) =>
              setMapping({ ...mapping, energy: { column } })
            }
          />
          <SelectField
            label="Each row covers"
            value={mapping.intervalMinutes}
            onChange={(e) =>
              setMapping({
                ...mapping,
                intervalMinutes: Number(e.target.value) as 15 | 30 | 60,
              })
            }
          >
            <option value={15}>15 minutes</option>
            <option value={30}>30 minutes</option>
            <option value={60}>60 minutes</option>
          </SelectField>
        </>
      )}
      <SelectField
        label="Date format"
        value={choice.dateOrder}
        onChange={(e) =>
          onChange({ ...choice, dateOrder: e.target.value as DateOrder | "" })
        }
      >
        {DATE_FORMATS.map((f) => (
          <option key={f.value} value={f.value}>
            {f.label}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Times are the site's clock in"
        value={choice.timeZone}
        onChange={(e) => onChange({ ...choice, timeZone: e.target.value })}
      >
        {timeZones
          .filter((zone) => zone !== "UTC")
          .map((zone) => (
            <option key={zone} value={zone}>
              {zone}
            </option>
          ))}
        <option value="UTC">UTC (files kept in GMT all year)</option>
      </SelectField>
    </fieldset>
  );
}
