import { type ReactNode } from "react";
import { useHydrated } from "~/lib/use-hydrated";
import { data, Form, Link, useNavigation, useSubmit } from "react-router";
import { z } from "zod";
import { analyseSite, siteDefaults } from "~/baselines/analysis.server";
import {
  getBaseline,
  listBaselines,
  saveBaseline,
} from "~/baselines/baselines.server";
import {
  degreeDayLabel,
  driverLabels,
  type DegreeDayDriver,
} from "~/baselines/degree-days";
import {
  GUIDELINE_14,
  MODEL_PARAMETERS,
  shortBaselineWarning,
} from "~/baselines/regression";
import { MAX_WEATHER_BYTES, parseWeatherCsv } from "~/baselines/weather-csv";
import { storeWeather, weatherCoverage } from "~/baselines/weather.server";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import {
  Badge,
  Button,
  Card,
  cx,
  EmptyState,
  Field,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import {
  BaselineScatter,
  DegreeDayChart,
  monthLabel,
} from "~/components/weather/weather-charts";
import {
  WeatherUpload,
  type UploadResult,
} from "~/components/weather/weather-upload";
import type { Carrier } from "~/db/schema";
import { parseForm } from "~/lib/forms";
import { idField, isUuid } from "~/lib/ids";
import { dayUtc } from "~/lib/times";
import { carrierLabels, carriers } from "~/sites/meter-schema";
import { getSite, listSites } from "~/sites/sites.server";
import type { Route } from "./+types/weather-baselines";

export const meta: Route.MetaFunction = () => [
  { title: "Weather & baselines · Joulebook" },
];

const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;
/** A period of at most ten years. */
const MAX_MONTHS = 120;

const isCarrier = (v: string | null): v is Carrier =>
  v !== null && (carriers as readonly string[]).includes(v);
const isDriver = (v: string | null): v is DegreeDayDriver =>
  v === "hdd" || v === "cdd";
const defaultDriver = (carrier: Carrier): DegreeDayDriver =>
  carrier === "cooling" ? "cdd" : "hdd";

function monthSpan(from: string, to: string): number {
  const [fy, fm] = from.split("-").map(Number);
  const [ty, tm] = to.split("-").map(Number);
  return (ty - fy) * 12 + (tm - fm) + 1;
}

/** Errors of a from/to pair of months, under the fields' names. */
function periodErrors(
  from: string,
  to: string,
  names: [string, string],
): Record<string, string> {
  const errors: Record<string, string> = {};
  if (!MONTH.test(from)) errors[names[0]] = "Use a month like 2025-01.";
  if (!MONTH.test(to)) errors[names[1]] = "Use a month like 2025-12.";
  else if (!errors[names[0]] && to < from)
    errors[names[1]] = "The last month comes before the first.";
  else if (!errors[names[0]] && monthSpan(from, to) > MAX_MONTHS)
    errors[names[1]] = `Choose at most ${MAX_MONTHS} months.`;
  return errors;
}

/** A site of this organisation, or 404: ids of other organisations reveal nothing. */
async function siteOr404(organizationId: string, siteId: string) {
  const site = isUuid(siteId)
    ? await getSite({ organizationId, siteId })
    : null;
  if (!site) notFound("No such site.");
  return site;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "ledger.view");
  const sites = await listSites({ organizationId: organization.id });
  const canManage = can(role, "sites.manage");
  const base = {
    organization,
    canManage,
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
  };
  const url = new URL(request.url);
  const q = (name: string) => url.searchParams.get(name);
  const siteParam = q("site");
  if (!siteParam && sites.length === 0)
    return { ...base, view: null, savedList: [], coverage: null };
  const site = await siteOr404(organization.id, siteParam ?? sites[0].id);

  const requested = q("carrier");
  const defaults = await siteDefaults({
    organizationId: organization.id,
    siteId: site.id,
    carrier: isCarrier(requested) ? requested : null,
    now: new Date(),
  });
  const [coverage, savedList] = await Promise.all([
    weatherCoverage({ organizationId: organization.id, siteId: site.id }),
    defaults.carrier
      ? listBaselines({
          organizationId: organization.id,
          siteId: site.id,
          carrier: defaults.carrier,
        })
      : Promise.resolve([]),
  ]);
  const siteView = {
    id: site.id,
    name: site.name,
    timeZone: site.timeZone,
    degreeDayBaseC: Number(site.degreeDayBaseC),
    floorAreaM2: site.floorAreaM2 === null ? null : Number(site.floorAreaM2),
  };
  const carrier = defaults.carrier;
  const periods = {
    baseFrom: q("baseFrom") || defaults.periods.baseFrom,
    baseTo: q("baseTo") || defaults.periods.baseTo,
    reportFrom: q("reportFrom") || defaults.periods.reportFrom,
    reportTo: q("reportTo") || defaults.periods.reportTo,
  };
  const errors = {
    ...periodErrors(periods.baseFrom, periods.baseTo, ["baseFrom", "baseTo"]),
    ...periodErrors(periods.reportFrom, periods.reportTo, [
      "reportFrom",
      "reportTo",
    ]),
  };
  const requestedDriver = q("driver");
  const driver = isDriver(requestedDriver)
    ? requestedDriver
    : carrier
      ? defaultDriver(carrier)
      : "hdd";
  const baselineParam = q("baseline") ?? "";
  // A saved baseline of another site or carrier is not applied here.
  const saved =
    carrier && isUuid(baselineParam)
      ? await getBaseline({
          organizationId: organization.id,
          id: baselineParam,
        })
      : null;
  const applied =
    saved && saved.siteId === site.id && saved.carrier === carrier
      ? saved
      : null;
  const analysis =
    carrier && Object.keys(errors).length === 0
      ? await analyseSite({
          organizationId: organization.id,
          site,
          carrier,
          driver,
          periods,
          saved: applied,
        })
      : null;
  return {
    ...base,
    coverage,
    savedList,
    view: {
      site: siteView,
      carriers: defaults.carriers,
      carrier,
      driver: applied ? applied.model.driver : driver,
      periods,
      errors,
      saved: applied,
      analysis,
    },
  };
}

const saveSchema = z.strictObject({
  intent: z.literal("save-baseline"),
  siteId: idField("Choose a site."),
  carrier: z.enum(carriers, { error: "Choose a carrier." }),
  driver: z.enum(["hdd", "cdd"], { error: "Choose degree days." }),
  from: z.string().regex(MONTH, "Choose a month, like 2025-01."),
  to: z.string().regex(MONTH, "Choose a month, like 2025-12."),
});

type SaveResult = {
  intent: "save-baseline";
  errors: Record<string, string>;
  message?: string;
};
type ActionResult = SaveResult | UploadResult;

/** Room for the form fields and multipart framing around the file itself. */
const BODY_LIMIT = MAX_WEATHER_BYTES + 64 * 1024;
/**
 * A body somewhat over the limit is read to its end and dropped, so the
 * sender gets the answer rather than a reset connection; a larger one is
 * cut off.
 */
const DRAIN_LIMIT = 16 * 1024 * 1024;

class TooLarge extends Error {}

/** Reads a form body of at most BODY_LIMIT bytes, whatever its length header says. */
async function readForm(request: Request): Promise<FormData> {
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > DRAIN_LIMIT) throw new TooLarge();
  const chunks: Uint8Array[] = [];
  let size = 0;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > DRAIN_LIMIT) {
        await reader.cancel();
        throw new TooLarge();
      }
      if (size <= BODY_LIMIT) chunks.push(value);
    }
  }
  if (size > BODY_LIMIT) throw new TooLarge();
  const headers = new Headers(request.headers);
  headers.delete("content-length");
  return new Request(request.url, {
    method: "POST",
    headers,
    body: Buffer.concat(chunks),
  }).formData();
}

const TOO_LARGE = `The upload is larger than ${(MAX_WEATHER_BYTES / 1e6).toLocaleString("en-GB")} MB; send the weather in parts.`;

async function uploadWeather(
  formData: FormData,
  organizationId: string,
  actorUserId: string,
) {
  const fail = (errors: Record<string, string>, status = 400) =>
    data<ActionResult>({ intent: "upload-weather", errors }, { status });
  const keys = [...new Set(formData.keys())];
  if (keys.some((k) => !["intent", "siteId", "file"].includes(k)))
    return fail({ form: "The form has fields it should not have." });
  const chosen = formData.get("siteId");
  const siteId = typeof chosen === "string" ? chosen.trim() : "";
  if (!isUuid(siteId) || formData.getAll("siteId").length !== 1)
    return fail({ siteId: "Choose a site." });
  const site = await siteOr404(organizationId, siteId);
  const file = formData.get("file");
  if (!(file instanceof File) || formData.getAll("file").length !== 1)
    return fail({ file: "Choose a CSV file." });
  if (file.size === 0) return fail({ file: "The file is empty." });
  if (file.size > MAX_WEATHER_BYTES) return fail({ file: TOO_LARGE }, 413);
  const parsed = parseWeatherCsv(await file.text());
  if (!parsed.ok)
    return data<ActionResult>(
      {
        intent: "upload-weather",
        errors: parsed.file
          ? { file: `${parsed.file} Nothing was stored.` }
          : {
              file: `${parsed.problemCount} rows have problems; nothing was stored.`,
            },
        problems: parsed.problems,
        problemCount: parsed.problemCount,
      },
      { status: 400 },
    );
  const stored = await storeWeather({
    organizationId,
    siteId: site.id,
    actorUserId,
    rows: parsed.rows,
  });
  return data<ActionResult>({
    intent: "upload-weather",
    errors: {},
    message: `Stored ${parsed.rows.length.toLocaleString("en-GB")} days for ${site.name}, ${stored.from} to ${stored.to}: ${stored.inserted.toLocaleString("en-GB")} new, ${stored.updated.toLocaleString("en-GB")} replaced.`,
  });
}

export async function action({ request, context }: Route.ActionArgs) {
  // Both actions change the organisation's data: managers and owners only,
  // checked before the body is read.
  const { organization, user } = requirePermission(context, "sites.manage");
  let formData: FormData;
  try {
    formData = await readForm(request);
  } catch (error) {
    if (error instanceof TooLarge)
      return data<ActionResult>(
        { intent: "upload-weather", errors: { file: TOO_LARGE } },
        { status: 413 },
      );
    return data<ActionResult>(
      {
        intent: "upload-weather",
        errors: { form: "The form could not be read." },
      },
      { status: 400 },
    );
  }
  const intent = formData.get("intent");
  if (intent === "upload-weather")
    return uploadWeather(formData, organization.id, user.id);

  const form = parseForm(formData, saveSchema);
  if (!form.ok) {
    const { intent: unknown, ...errors } = form.errors;
    if (unknown) errors.form ??= "Unknown action.";
    return data<ActionResult>(
      { intent: "save-baseline", errors },
      { status: 400 },
    );
  }
  const { from, to } = form.data;
  const periodProblems = periodErrors(from, to, ["from", "to"]);
  if (Object.keys(periodProblems).length > 0)
    return data<ActionResult>(
      { intent: "save-baseline", errors: periodProblems },
      { status: 400 },
    );
  const site = await siteOr404(organization.id, form.data.siteId);
  const saved = await saveBaseline({
    organizationId: organization.id,
    actorUserId: user.id,
    site,
    carrier: form.data.carrier,
    driver: form.data.driver,
    from,
    to,
  });
  if (!saved.ok)
    return data<ActionResult>(
      { intent: "save-baseline", errors: { form: saved.reason } },
      { status: 409 },
    );
  return data<ActionResult>({
    intent: "save-baseline",
    errors: {},
    message: `Baseline saved for ${site.name}, ${carrierLabels[form.data.carrier].toLowerCase()}, ${monthLabel(from)} to ${monthLabel(to)}. Savings can now be reckoned against it, whatever changes later.`,
  });
}

// ---------------------------------------------------------------------------
// The page
// ---------------------------------------------------------------------------

const fmt = (value: number | null | undefined, digits = 0) =>
  value === null || value === undefined || !Number.isFinite(value)
    ? "—"
    : value.toLocaleString("en-GB", {
        minimumFractionDigits: digits,
        maximumFractionDigits: digits,
      });
const MINUS = "\u2212";
/** A signed figure with a real minus sign, and no sign on what shows as zero. */
function signed(value: number, digits = 0): string {
  const text = fmt(Math.abs(value), digits);
  if (!/[1-9]/.test(text)) return text;
  return `${value < 0 ? MINUS : "+"}${text}`;
}

type LoaderData = Route.ComponentProps["loaderData"];
type View = NonNullable<LoaderData["view"]>;
type AnalysisView = NonNullable<View["analysis"]>;

function Stat({
  label,
  children,
  badge,
}: {
  label: string;
  children: ReactNode;
  badge?: ReactNode;
}) {
  return (
    <div className="rounded-lg bg-paper px-3 py-2">
      <dt className="text-sm text-ink-muted">{label}</dt>
      <dd className="text-lg font-semibold tabular-nums">{children}</dd>
      {badge ? <dd className="mt-1">{badge}</dd> : null}
    </div>
  );
}

function PassBadge({ pass }: { pass: boolean }) {
  return pass ? (
    <Badge tone="spruce">Pass</Badge>
  ) : (
    <Badge tone="danger">Fail</Badge>
  );
}

function Controls({ view, sites }: { view: View; sites: LoaderData["sites"] }) {
  const submit = useSubmit();
  const { periods, errors } = view;
  return (
    <Card aria-labelledby="controls-heading">
      <h2 id="controls-heading" className="sr-only">
        Site, carrier and periods
      </h2>
      <Form
        key={`${view.site.id}|${view.carrier}|${view.driver}|${Object.values(periods).join("|")}|${view.saved?.id ?? ""}`}
        method="get"
        preventScrollReset
        onChange={(e) =>
          submit(e.currentTarget, { replace: true, preventScrollReset: true })
        }
        className="grid gap-4 sm:grid-cols-3 lg:grid-cols-4 lg:items-end"
      >
        <SelectField label="Site" name="site" defaultValue={view.site.id}>
          {sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Carrier"
          name="carrier"
          defaultValue={view.carrier ?? ""}
          disabled={view.carriers.length === 0}
        >
          {view.carriers.length === 0 ? (
            <option value="">No import meters</option>
          ) : null}
          {view.carriers.map((c) => (
            <option key={c} value={c}>
              {carrierLabels[c]}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Degree days"
          name="driver"
          defaultValue={view.driver}
          disabled={view.saved !== null}
        >
          <option value="hdd">Heating (HDD)</option>
          <option value="cdd">Cooling (CDD)</option>
        </SelectField>
        <div className="hidden lg:block" />
        <Field
          label="Baseline from"
          name="baseFrom"
          type="month"
          defaultValue={view.saved ? view.saved.from : periods.baseFrom}
          error={errors.baseFrom}
          disabled={view.saved !== null}
        />
        <Field
          label="Baseline to"
          name="baseTo"
          type="month"
          defaultValue={view.saved ? view.saved.to : periods.baseTo}
          error={errors.baseTo}
          disabled={view.saved !== null}
        />
        <Field
          label="Reporting from"
          name="reportFrom"
          type="month"
          defaultValue={periods.reportFrom}
          error={errors.reportFrom}
        />
        <Field
          label="Reporting to"
          name="reportTo"
          type="month"
          defaultValue={periods.reportTo}
          error={errors.reportTo}
        />
        {view.saved ? (
          <input type="hidden" name="baseline" value={view.saved.id} />
        ) : null}
        <noscript>
          <Button type="submit">Show</Button>
        </noscript>
      </Form>
      <p className="mt-3 text-sm text-ink-muted">
        Degree days to a base of{" "}
        {fmt(view.analysis?.baseC ?? view.site.degreeDayBaseC, 1)} °C (
        {view.saved ? "the saved baseline's base" : "the site's base"}), summed
        over the days of each month in the site's calendar ({view.site.timeZone}
        ). Energy: what the import meters on the site's boundary metered, from
        the ledger.
      </p>
    </Card>
  );
}

function ModelCard({
  view,
  analysis,
  canManage,
  result,
}: {
  view: View;
  analysis: AnalysisView;
  canManage: boolean;
  result: SaveResult | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const { model, assessment } = analysis;
  const degreeDays = degreeDayLabel(analysis.driver, analysis.baseC);
  const tooShort = model ? shortBaselineWarning(analysis.basePoints) : null;
  const limits = GUIDELINE_14[view.saved?.granularity ?? "monthly"];
  return (
    <Card aria-labelledby="model-heading">
      <h2 id="model-heading" className="text-lg">
        {view.saved ? "Saved baseline" : "Baseline model"}
      </h2>
      {view.saved ? (
        <p className="mt-1 text-ink-muted">
          Saved {dayUtc(view.saved.createdAt)}
          {view.saved.createdBy ? ` by ${view.saved.createdBy}` : ""}, fitted on{" "}
          {monthLabel(view.saved.from)} to {monthLabel(view.saved.to)}. Its
          model and months stay as saved.{" "}
          <Link
            className="font-semibold text-spruce-700 underline"
            to={`?site=${view.site.id}&carrier=${view.carrier}&reportFrom=${view.periods.reportFrom}&reportTo=${view.periods.reportTo}`}
          >
            Fit on other months instead
          </Link>
        </p>
      ) : (
        <p className="mt-1 text-ink-muted">
          Ordinary least squares of monthly energy on monthly{" "}
          {driverLabels[analysis.driver].toLowerCase()}, over the baseline
          months with complete weather and a ledger entry.
        </p>
      )}
      {model && assessment ? (
        <>
          <p className="mt-4 text-lg">
            <span className="font-semibold">E</span> ={" "}
            <span className="tabular-nums">{fmt(model.intercept)}</span> kWh{" "}
            {model.slope < 0 ? MINUS : "+"}{" "}
            <span className="tabular-nums">
              {fmt(Math.abs(model.slope), 2)}
            </span>{" "}
            kWh per degree day × {degreeDays}{" "}
            <span className="text-base text-ink-muted">per month</span>
          </p>
          <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4 xl:grid-cols-2 2xl:grid-cols-4">
            <Stat label="Months (n)">{model.n}</Stat>
            <Stat label="R²">{fmt(model.r2, 4)}</Stat>
            <Stat
              label={`CV(RMSE), limit ${limits.cvrmse} %`}
              badge={<PassBadge pass={assessment.cvrmse.pass} />}
            >
              {fmt(model.cvrmse, 2)} %
            </Stat>
            <Stat
              label={`NMBE, limit ±${limits.nmbe} %`}
              badge={<PassBadge pass={assessment.nmbe.pass} />}
            >
              {model.nmbe === null ? "—" : signed(model.nmbe, 2)} %
            </Stat>
          </dl>
          {tooShort ? (
            <div className="mt-3">
              <Notice tone="caution" title="Shorter than a year">
                {tooShort}
              </Notice>
            </div>
          ) : null}
          {model.r2 !== null && model.r2 < 0.5 ? (
            <div className="mt-3">
              <Notice tone="caution">
                R² is {fmt(model.r2, 2)}: the degree days explain about{" "}
                {fmt(100 * model.r2)} % of the month-to-month change in this
                energy, so the model is close to a constant. Check the carrier
                and the kind of degree days.
              </Notice>
            </div>
          ) : null}
          <div className="mt-4 text-sm text-ink-muted">
            <p>
              Criteria of ASHRAE Guideline 14 for{" "}
              {view.saved?.granularity === "daily" ? "daily" : "monthly"} data:
              CV(RMSE) ≤ {limits.cvrmse} % and NMBE within ±{limits.nmbe} %.
            </p>
            <p className="mt-1">
              CV(RMSE) = 100 · √(Σ(actual − model)² ÷ (n − p)) ÷ mean, and NMBE
              = 100 · Σ(actual − model) ÷ ((n − p) · mean), both with the
              divisor n − p = {model.n} − {MODEL_PARAMETERS} ={" "}
              {model.n - MODEL_PARAMETERS} (p = {MODEL_PARAMETERS}: intercept
              and slope). NMBE is positive when the metered energy lies above
              the model. A least-squares fit with an intercept has NMBE 0 on its
              own months by construction.
            </p>
          </div>
        </>
      ) : (
        <div className="mt-3">
          <Notice tone="caution">
            {analysis.modelError ?? "No model for these months."}
          </Notice>
        </div>
      )}
      {canManage && !view.saved && model && view.carrier ? (
        <Form
          method="post"
          className="mt-4 flex flex-wrap items-center gap-3"
          aria-label="Save this baseline"
        >
          <input type="hidden" name="intent" value="save-baseline" />
          <input type="hidden" name="siteId" value={view.site.id} />
          <input type="hidden" name="carrier" value={view.carrier} />
          <input type="hidden" name="driver" value={analysis.driver} />
          <input type="hidden" name="from" value={view.periods.baseFrom} />
          <input type="hidden" name="to" value={view.periods.baseTo} />
          <Button type="submit" disabled={busy}>
            Save baseline
          </Button>
          <span className="text-sm text-ink-muted">
            Keeps this model and its months; the audit log records who saved it.
          </span>
        </Form>
      ) : null}
      {result?.message ? (
        <div className="mt-3">
          <Notice tone="success">{result.message}</Notice>
        </div>
      ) : null}
      {result?.errors.form ? (
        <div className="mt-3">
          <Notice tone="error">{result.errors.form}</Notice>
        </div>
      ) : null}
    </Card>
  );
}

function EnpiCard({ analysis, view }: { analysis: AnalysisView; view: View }) {
  const degreeDays = degreeDayLabel(analysis.driver, analysis.baseC);
  const rows = [
    ["Baseline period", analysis.baseline, analysis.enpis.baseline],
    ["Reporting period", analysis.reporting, analysis.enpis.reporting],
  ] as const;
  return (
    <Card aria-labelledby="enpi-heading">
      <h2 id="enpi-heading" className="text-lg">
        Energy performance indicators
      </h2>
      <p className="mt-1 text-ink-muted">
        Ratio EnPIs in the sense of ISO 50006 over the months counted; the
        regression above is the statistical EnPI. Energy per degree day includes
        the base load, so it falls as degree days rise.
      </p>
      <div className="mt-3 overflow-x-auto">
        <table className="min-w-full text-sm">
          <thead className="bg-sunken">
            <tr>
              <th className="px-2 py-1 text-left">Period</th>
              <th className="px-2 py-1 text-right">Months</th>
              <th className="px-2 py-1 text-right">Energy (kWh)</th>
              <th className="px-2 py-1 text-right">{degreeDays}</th>
              <th className="px-2 py-1 text-right">kWh per degree day</th>
              <th className="px-2 py-1 text-right">kWh per m²</th>
            </tr>
          </thead>
          <tbody>
            {rows.map(([label, period, e]) => (
              <tr key={label} className="border-t border-line tabular-nums">
                <th scope="row" className="px-2 py-1 text-left font-semibold">
                  {label}{" "}
                  <span className="font-normal text-ink-muted">
                    {monthLabel(period.from)}–{monthLabel(period.to)}
                  </span>
                </th>
                <td className="px-2 py-1 text-right">{e.months}</td>
                <td className="px-2 py-1 text-right">{fmt(e.kwh)}</td>
                <td className="px-2 py-1 text-right">{fmt(e.degreeDays, 1)}</td>
                <td className="px-2 py-1 text-right">
                  {fmt(e.kwhPerDegreeDay, 1)}
                </td>
                <td className="px-2 py-1 text-right">{fmt(e.kwhPerM2, 2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {view.site.floorAreaM2 === null ? (
        <p className="mt-2 text-sm text-ink-muted">
          The site has no floor area, so there is no figure per m².
        </p>
      ) : (
        <p className="mt-2 text-sm text-ink-muted">
          Floor area {fmt(view.site.floorAreaM2)} m².
        </p>
      )}
    </Card>
  );
}

function SavingsCard({ analysis }: { analysis: AnalysisView }) {
  const { savings } = analysis;
  const degreeDays = degreeDayLabel(analysis.driver, analysis.baseC);
  const skipped = analysis.months.filter(
    (m) =>
      !m.usable &&
      m.month >= analysis.reporting.from &&
      m.month <= analysis.reporting.to,
  );
  return (
    <Card aria-labelledby="savings-heading">
      <h2 id="savings-heading" className="text-lg">
        Weather-normalised savings
      </h2>
      <p className="mt-1 text-ink-muted">
        Avoided energy use = adjusted baseline − reporting-period energy: the
        baseline model restated to each reporting month's degree days, less what
        was metered. Positive means less energy was used than the baseline
        predicts for that weather.
      </p>
      {savings ? (
        <>
          <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4">
            <Stat label="Adjusted baseline">
              {fmt(savings.adjustedBaselineKwh)} kWh
            </Stat>
            <Stat label="Metered">{fmt(savings.reportingKwh)} kWh</Stat>
            <Stat label="Avoided energy use">
              {signed(savings.avoidedKwh)} kWh
            </Stat>
            <Stat label="Of the adjusted baseline">
              {savings.avoidedPercent === null
                ? "—"
                : `${signed(savings.avoidedPercent, 1)} %`}
            </Stat>
          </dl>
          {analysis.extrapolated.length > 0 ? (
            <div className="mt-3">
              <Notice tone="caution">
                {analysis.extrapolated.map(monthLabel).join(", ")}{" "}
                {analysis.extrapolated.length === 1 ? "has" : "have"} degree
                days outside the baseline months' range: the model is
                extrapolated there.
              </Notice>
            </div>
          ) : null}
          <div className="mt-3 max-h-96 overflow-auto">
            <table className="min-w-full text-sm">
              <thead className="sticky top-0 bg-sunken">
                <tr>
                  <th className="px-2 py-1 text-left">Month</th>
                  <th className="px-2 py-1 text-right">{degreeDays}</th>
                  <th className="px-2 py-1 text-right">
                    Adjusted baseline (kWh)
                  </th>
                  <th className="px-2 py-1 text-right">Metered (kWh)</th>
                  <th className="px-2 py-1 text-right">Avoided (kWh)</th>
                </tr>
              </thead>
              <tbody>
                {savings.months.map((m) => (
                  <tr
                    key={m.month}
                    className="border-t border-line tabular-nums"
                  >
                    <td className="px-2 py-1">{monthLabel(m.month)}</td>
                    <td className="px-2 py-1 text-right">{fmt(m.dd, 1)}</td>
                    <td className="px-2 py-1 text-right">
                      {fmt(m.adjustedKwh)}
                    </td>
                    <td className="px-2 py-1 text-right">{fmt(m.actualKwh)}</td>
                    <td
                      className={cx(
                        "px-2 py-1 text-right font-semibold",
                        m.avoidedKwh < 0 && "text-danger-700",
                      )}
                    >
                      {signed(m.avoidedKwh)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      ) : (
        <p className="mt-3">
          {analysis.model
            ? "No reporting month has both complete weather and a ledger entry."
            : "Savings need a baseline model first."}
        </p>
      )}
      {skipped.length > 0 ? (
        <p className="mt-2 text-sm text-ink-muted">
          Left out of the reporting period:{" "}
          {skipped.map((m) => `${monthLabel(m.month)} (${m.note})`).join(", ")}.
        </p>
      ) : null}
    </Card>
  );
}

function MonthTable({ analysis }: { analysis: AnalysisView }) {
  const inPeriod = (month: string) =>
    month >= analysis.baseline.from && month <= analysis.baseline.to
      ? "Baseline"
      : month >= analysis.reporting.from && month <= analysis.reporting.to
        ? "Reporting"
        : "";
  return (
    <div className="max-h-96 overflow-auto rounded-lg border border-line">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Monthly degree days and energy</caption>
        <thead className="sticky top-0 bg-sunken">
          <tr>
            <th className="px-2 py-1 text-left">Month</th>
            <th className="px-2 py-1 text-left">Period</th>
            <th className="px-2 py-1 text-right">Weather days</th>
            <th className="px-2 py-1 text-right">
              {degreeDayLabel("hdd", analysis.baseC)}
            </th>
            <th className="px-2 py-1 text-right">
              {degreeDayLabel("cdd", analysis.baseC)}
            </th>
            <th className="px-2 py-1 text-right">Energy (kWh)</th>
            <th className="px-2 py-1 text-right">Estimated</th>
            <th className="px-2 py-1 text-left">Note</th>
          </tr>
        </thead>
        <tbody>
          {analysis.months.map((m) => (
            <tr
              key={m.month}
              data-month={m.month}
              className="border-t border-line tabular-nums"
            >
              <td className="px-2 py-1">{monthLabel(m.month)}</td>
              <td className="px-2 py-1">{inPeriod(m.month)}</td>
              <td className="px-2 py-1 text-right">
                {`${m.weatherDays}/${m.daysInMonth}`}
              </td>
              <td className="px-2 py-1 text-right" data-hdd={m.hdd.toFixed(2)}>
                {fmt(m.hdd, 1)}
              </td>
              <td className="px-2 py-1 text-right" data-cdd={m.cdd.toFixed(2)}>
                {fmt(m.cdd, 1)}
              </td>
              <td className="px-2 py-1 text-right">{fmt(m.kwh)}</td>
              <td className="px-2 py-1 text-right">
                {m.kwh ? `${fmt((100 * m.estimatedKwh) / m.kwh, 1)} %` : "—"}
              </td>
              <td className="px-2 py-1 text-ink-muted">{m.note ?? ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function SavedList({
  view,
  savedList,
}: {
  view: View;
  savedList: LoaderData["savedList"];
}) {
  if (savedList.length === 0) return null;
  const link = (id: string) =>
    `?site=${view.site.id}&carrier=${view.carrier}&baseline=${id}&reportFrom=${view.periods.reportFrom}&reportTo=${view.periods.reportTo}`;
  return (
    <Card aria-labelledby="saved-heading">
      <h2 id="saved-heading" className="text-lg">
        Saved baselines
      </h2>
      <div className="mt-3 overflow-x-auto">
        <table className="min-w-full text-sm">
          <thead className="bg-sunken">
            <tr>
              <th className="px-2 py-1 text-left">Months</th>
              <th className="px-2 py-1 text-left">Model</th>
              <th className="px-2 py-1 text-right">R²</th>
              <th className="px-2 py-1 text-right">CV(RMSE)</th>
              <th className="px-2 py-1 text-right">NMBE</th>
              <th className="px-2 py-1 text-left">Saved</th>
              <th className="px-2 py-1 text-left">
                <span className="sr-only">Use</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {savedList.map((b) => (
              <tr
                key={b.id}
                className={cx(
                  "border-t border-line tabular-nums",
                  view.saved?.id === b.id && "bg-spruce-50",
                )}
              >
                <td className="px-2 py-1">
                  {monthLabel(b.from)}–{monthLabel(b.to)}
                  {shortBaselineWarning(b.model.points) ? (
                    <span className="mt-1 block whitespace-nowrap">
                      <Badge tone="copper">Under a year</Badge>
                    </span>
                  ) : null}
                </td>
                <td className="px-2 py-1">
                  {fmt(b.model.intercept)} + {fmt(b.model.slope, 2)} ×{" "}
                  {b.model.driver.toUpperCase()}
                </td>
                <td className="px-2 py-1 text-right">{fmt(b.model.r2, 4)}</td>
                <td className="px-2 py-1 text-right">
                  {fmt(b.model.cvrmse, 2)} %
                </td>
                <td className="px-2 py-1 text-right">
                  {b.model.nmbe === null ? "—" : signed(b.model.nmbe, 2)} %
                </td>
                <td className="px-2 py-1">
                  {dayUtc(b.createdAt)}
                  {b.createdBy ? `, ${b.createdBy}` : ""}
                </td>
                <td className="px-2 py-1">
                  {view.saved?.id === b.id ? (
                    <Badge tone="spruce">In use</Badge>
                  ) : (
                    <Link
                      className="font-semibold text-spruce-700 underline"
                      to={link(b.id)}
                    >
                      Use for savings
                    </Link>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </Card>
  );
}

export default function WeatherBaselines({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { view, sites, canManage, coverage, savedList } = loaderData;
  const result = actionData as ActionResult | undefined;
  // Charts measure the page, so they render in the browser only.
  const mounted = useHydrated();
  const analysis = view?.analysis ?? null;
  const ddLabel = analysis ? driverLabels[analysis.driver] : "";
  const energyLabel = view?.carrier
    ? `${carrierLabels[view.carrier]} energy`
    : "Energy";
  const chartMonths = analysis?.months ?? [];
  return (
    <>
      <PageHeader
        title="Weather & baselines"
        description="Degree days from each site's daily mean outdoor temperature, energy baselines fitted on them, and the energy avoided against a baseline in the weather that came."
      />
      <div className="flex flex-col gap-6">
        {!view ? (
          <EmptyState title="No sites yet">
            Weather and baselines belong to a site: add one under Sites.
          </EmptyState>
        ) : (
          <>
            <Controls view={view} sites={sites} />
            {coverage && coverage.days === 0 ? (
              <Notice tone="caution" title="No weather for this site">
                Degree days need the site's daily mean temperatures.{" "}
                {canManage
                  ? "Upload them below."
                  : "An energy manager or owner can upload them."}
              </Notice>
            ) : coverage ? (
              <p className="text-sm text-ink-muted">
                Weather for {coverage.days.toLocaleString("en-GB")} days, from{" "}
                {coverage.first} to {coverage.last}.
              </p>
            ) : null}
            {!view.carrier ? (
              <EmptyState title="No import meters on this site's boundary">
                Baselines are fitted on the energy delivered to a site.
              </EmptyState>
            ) : null}
            {analysis ? (
              <>
                <Card aria-labelledby="months-heading">
                  <h2 id="months-heading" className="text-lg">
                    Degree days and energy by month
                  </h2>
                  {mounted ? (
                    <DegreeDayChart
                      carrier={view.carrier}
                      months={chartMonths}
                      ddLabel={ddLabel}
                      energyLabel={energyLabel}
                      baseline={analysis.baseline}
                      reporting={analysis.reporting}
                    />
                  ) : null}
                  <details className="mt-3">
                    <summary className="cursor-pointer font-semibold text-spruce-700">
                      Figures by month
                    </summary>
                    <div className="mt-2">
                      <MonthTable analysis={analysis} />
                    </div>
                  </details>
                </Card>
                <div className="grid gap-6 xl:grid-cols-2">
                  <ModelCard
                    view={view}
                    analysis={analysis}
                    canManage={canManage}
                    result={
                      result?.intent === "save-baseline" ? result : undefined
                    }
                  />
                  <Card aria-labelledby="scatter-heading">
                    <h2 id="scatter-heading" className="text-lg">
                      Energy against degree days
                    </h2>
                    {mounted ? (
                      <BaselineScatter
                        carrier={view.carrier}
                        baseline={analysis.basePoints}
                        reporting={analysis.reportPoints}
                        line={analysis.model}
                        ddLabel={ddLabel}
                      />
                    ) : null}
                  </Card>
                </div>
                <SavingsCard analysis={analysis} />
                <EnpiCard analysis={analysis} view={view} />
              </>
            ) : null}
            <SavedList view={view} savedList={savedList} />
            {canManage ? (
              <Card aria-labelledby="upload-heading">
                <h2 id="upload-heading" className="text-lg">
                  Upload weather
                </h2>
                <p className="mt-1 text-ink-muted">
                  Daily mean outdoor temperature, °C, for the days of the site's
                  own calendar. The whole file is checked first: if any row is
                  wrong, nothing is stored.
                </p>
                <div className="mt-4">
                  <WeatherUpload
                    key={view.site.id}
                    sites={sites}
                    siteId={view.site.id}
                    result={
                      result?.intent === "upload-weather" ? result : undefined
                    }
                  />
                </div>
              </Card>
            ) : null}
          </>
        )}
        <Cautions />
      </div>
    </>
  );
}
