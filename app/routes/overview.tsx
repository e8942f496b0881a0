import { formatDistanceStrict } from "date-fns";
import { monthKey } from "~/lib/months";
import { useHydrated } from "~/lib/use-hydrated";
import { data, Form, Link } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { CarrierBadge } from "~/components/carrier-badge";
import { ChangePill } from "~/components/change-pill";
import { Cautions } from "~/components/cautions";
import { CarrierChart } from "~/components/overview/carrier-chart";
import {
  Button,
  Card,
  EmptyState,
  Field,
  Notice,
  PageHeader,
} from "~/components/ui";
import {
  alertPreferences,
  saveAlertPreferences,
} from "~/alerts/alert-settings.server";
import { parseForm } from "~/lib/forms";
import {
  againstBaseline,
  completeness,
  monthlyByCarrier,
  setupProgress,
  silentMeters,
  siteDrift,
  type SetupProgress,
} from "~/overview/estate-overview.server";
import type { Route } from "./+types/overview";

export const meta: Route.MetaFunction = () => [
  { title: "Overview · Joulebook" },
];

const querySchema = z.object({
  silent: z.coerce
    .number()
    .int()
    .min(1)
    .max(24 * 90)
    .catch(24),
});

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization, user, role } = requirePermission(
    context,
    "ledger.view",
  );
  const { silent } = querySchema.parse(
    Object.fromEntries(new URL(request.url).searchParams),
  );
  const now = new Date();
  const lastFull = new Date(
    Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1),
  );
  const firstOfChart = new Date(
    Date.UTC(lastFull.getUTCFullYear(), lastFull.getUTCMonth() - 11, 1),
  );
  const [setup, drift, silentList, complete, byCarrier, baselines] =
    await Promise.all([
      setupProgress(organization.id),
      siteDrift(organization.id, monthKey(lastFull)),
      silentMeters(organization.id, silent, now),
      completeness(organization.id, 30, now),
      monthlyByCarrier(
        organization.id,
        monthKey(firstOfChart),
        monthKey(lastFull),
      ),
      againstBaseline(organization.id, monthKey(lastFull)),
    ]);
  const alerts = await alertPreferences(organization.id, user.id, role);
  return {
    organization,
    month: monthKey(lastFull),
    setup,
    canManageSites: can(role, "sites.manage"),
    canManageGateways: can(role, "gateways.manage"),
    drift,
    silentList,
    silent,
    complete,
    byCarrier,
    baselines,
    now: now.toISOString(),
    alerts,
  };
}

const checkbox = z
  .enum(["on"])
  .optional()
  .transform((v) => v === "on");
const alertSchema = z.strictObject({
  intent: z.literal("alerts"),
  silentMeter: checkbox,
  residual: checkbox,
  monthReady: checkbox,
  silentHours: z.coerce
    .number({ error: "Enter a number of hours." })
    .int("Enter whole hours.")
    .min(1, "At least 1 hour.")
    .max(24 * 30, "At most 720 hours (30 days)."),
});

/** Each member chooses their own alert e-mails for this organisation. */
export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "ledger.view");
  const form = parseForm(await request.formData(), alertSchema);
  if (!form.ok)
    return data({ errors: form.errors, saved: false }, { status: 400 });
  const { intent: _intent, ...preferences } = form.data;
  await saveAlertPreferences(organization.id, user.id, preferences);
  return { errors: {} as Record<string, string>, saved: true };
}

function AlertSettings({
  alerts,
  errors,
  saved,
}: {
  alerts: {
    silentMeter: boolean;
    residual: boolean;
    monthReady: boolean;
    silentHours: number;
  };
  errors: Record<string, string | undefined>;
  saved: boolean;
}) {
  const options = [
    ["silentMeter", "A meter sends no data", alerts.silentMeter],
    [
      "residual",
      "Sub-meters miss their parent by more than the tolerance",
      alerts.residual,
    ],
    ["monthReady", "Last month is ready to close", alerts.monthReady],
  ] as const;
  return (
    <Card aria-labelledby="alerts-heading">
      <h2 id="alerts-heading" className="text-lg">
        Your alert e-mails
      </h2>
      <p className="text-sm text-ink-muted">
        One e-mail per check, listing the conditions that started; none again
        until each has cleared.
      </p>
      <Form method="post" className="mt-3 flex flex-col gap-3" noValidate>
        {saved ? <Notice tone="success">Alert settings saved.</Notice> : null}
        <input type="hidden" name="intent" value="alerts" />
        {options.map(([name, label, checked]) => (
          <label key={name} className="flex items-center gap-2">
            <input
              type="checkbox"
              name={name}
              defaultChecked={checked}
              className="h-5 w-5 accent-spruce-700"
            />
            {label}
          </label>
        ))}
        <Field
          label="No data for (hours)"
          name="silentHours"
          inputMode="numeric"
          defaultValue={String(alerts.silentHours)}
          error={errors.silentHours}
          className="max-w-48"
        />
        <div>
          <Button type="submit" variant="secondary">
            Save alert settings
          </Button>
        </div>
      </Form>
    </Card>
  );
}

/**
 * The first steps of an organisation: a site, a meter on it, a gateway to
 * send its readings. Each links to where it is done, for the roles that may
 * do it; a finished step is ticked.
 */
function FirstSteps({
  setup,
  base,
  canManageSites,
  canManageGateways,
}: {
  setup: SetupProgress;
  base: string;
  canManageSites: boolean;
  canManageGateways: boolean;
}) {
  const title =
    setup.sites === 0
      ? "No sites yet"
      : setup.meters === 0
        ? "No meters yet"
        : "No gateway yet";
  const steps = [
    {
      label: "Add a site",
      done: setup.sites > 0,
      allowed: canManageSites,
      to: `${base}/sites#new-site-heading`,
      text: "A building or estate whose energy you account for: its name, time zone and floor area.",
    },
    {
      label: "Add a meter",
      done: setup.meters > 0,
      allowed: canManageSites,
      to: setup.firstSiteId
        ? `${base}/sites/${setup.firstSiteId}/meters/new`
        : `${base}/sites`,
      text: setup.firstSiteId
        ? "On the site's boundary: what it meters, its carrier, and whether it imports or exports."
        : "On the site's page, once there is a site: what it meters, its carrier, and whether it imports or exports.",
    },
    {
      label: "Add a gateway",
      done: setup.gateways > 0,
      allowed: canManageGateways,
      to: `${base}/gateways`,
      text: "It sends the meters' readings with its own key. Past readings can also be uploaded as CSV on Readings.",
    },
  ];
  return (
    <Card aria-labelledby="first-steps-heading">
      <h2 id="first-steps-heading" className="text-lg">
        {title}
      </h2>
      <p className="mt-1 text-ink-muted">
        The figures on this page appear once a meter on a site sends readings.
        Three steps get there:
      </p>
      <ol className="mt-4 grid gap-3 md:grid-cols-3">
        {steps.map((step, i) => (
          <li
            key={step.label}
            className="rounded-lg border border-line bg-paper p-4"
          >
            <p className="text-sm font-semibold text-ink-muted">
              {`Step ${i + 1}${step.done ? " · done" : ""}`}
            </p>
            {step.done ? (
              <p className="font-semibold">
                <span aria-hidden="true">✓ </span>
                {step.label}
              </p>
            ) : step.allowed ? (
              <Link
                to={step.to}
                className="font-semibold text-spruce-700 underline underline-offset-4"
              >
                {step.label}
              </Link>
            ) : (
              <p className="font-semibold">{step.label}</p>
            )}
            <p className="mt-1 text-sm text-ink-muted">
              {step.done || step.allowed
                ? step.text
                : "An owner or energy manager does this."}
            </p>
          </li>
        ))}
      </ol>
    </Card>
  );
}

/** A magnitude in whole kWh, as the Weather & baselines page shows it. */
function kwh(x: number | null): string {
  if (x === null) return "—";
  return `${x.toLocaleString("en-GB", { maximumFractionDigits: 0 })} kWh`;
}

/** Beyond this share either side of the baseline, a month is marked. */
const BASELINE_TOLERANCE = 0.1;
/** Beyond this change on a year before, a site's pill is marked. */
const DRIFT_TOLERANCE = 0.15;

type Comparison = Route.ComponentProps["loaderData"]["baselines"][number];

function AgainstBaseline({
  rows,
  month,
  base,
}: {
  rows: Comparison[];
  month: string;
  base: string;
}) {
  return (
    <Card aria-labelledby="baseline-heading">
      <h2 id="baseline-heading" className="text-lg">
        Against baseline
      </h2>
      <p className="text-sm text-ink-muted">
        {month} against what each site's newest saved baseline predicts for that
        month's degree days: ▲ more energy than expected, ▼ less; solid beyond ±
        {BASELINE_TOLERANCE * 100} %.
      </p>
      {rows.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="No baseline saved yet">
            Fit and save one for a site on{" "}
            <Link
              className="font-semibold text-spruce-700 underline"
              to={`${base}/weather`}
            >
              Weather &amp; baselines
            </Link>
            ; each month is then set against it here.
          </EmptyState>
        </div>
      ) : (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full text-left">
            <thead className="text-sm text-ink-muted">
              <tr>
                <th className="py-1 font-semibold">Site</th>
                <th className="py-1 font-semibold">Carrier</th>
                <th className="py-1 text-right font-semibold">Actual</th>
                <th className="py-1 text-right font-semibold">Expected</th>
                <th className="py-1 text-right font-semibold">Difference</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {rows.map((r) => (
                <tr
                  key={`${r.site_id}|${r.carrier}`}
                  data-site={r.site_id}
                  data-carrier={r.carrier}
                  data-actual-kwh={r.actual_kwh?.toFixed(3)}
                  data-expected-kwh={r.expected_kwh?.toFixed(3)}
                >
                  <td className="py-2">
                    <Link
                      className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                      to={`${base}/weather?site=${r.site_id}&carrier=${r.carrier}&baseline=${r.baseline_id}&reportFrom=${r.month}&reportTo=${r.month}`}
                    >
                      {r.site_name}
                    </Link>
                    {r.note || r.extrapolated ? (
                      <span className="block text-sm text-ink-muted">
                        {r.note ?? "degree days outside the baseline's range"}
                      </span>
                    ) : null}
                  </td>
                  <td className="py-2">
                    <CarrierBadge carrier={r.carrier} />
                  </td>
                  <td className="py-2 text-right tabular-nums">
                    {kwh(r.actual_kwh)}
                  </td>
                  <td className="py-2 text-right tabular-nums">
                    {kwh(r.expected_kwh)}
                  </td>
                  <td className="py-2 text-right tabular-nums">
                    <ChangePill
                      change={r.difference}
                      tolerance={BASELINE_TOLERANCE}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Card>
  );
}

export default function Overview({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const {
    organization,
    month,
    setup,
    canManageSites,
    canManageGateways,
    drift,
    silentList,
    silent,
    complete,
    byCarrier,
    baselines,
    now,
    alerts,
  } = loaderData;
  const mounted = useHydrated();
  const base = `/o/${organization.id}`;
  // Until readings arrive, the first steps lead the page; an organisation
  // that uploads readings without a gateway no longer sees them once it has.
  const showSteps =
    setup.sites === 0 ||
    setup.meters === 0 ||
    (setup.gateways === 0 && byCarrier.length === 0);
  const stats = [
    ["Sites", String(setup.sites)],
    ["Actual, last 30 days", `${(complete.measuredShare * 100).toFixed(1)} %`],
    [
      "Estimated, last 30 days",
      `${(complete.estimatedShare * 100).toFixed(1)} %`,
    ],
    [`No data over ${silent} h`, String(silentList.length)],
  ];
  return (
    <>
      <PageHeader
        title="Overview"
        description={`${organization.name} at a glance. Energy delivered to the sites is positive, energy exported negative, each carrier on its own; chilled water counts as cooling delivered.`}
      />
      <div className="flex flex-col gap-6">
        {showSteps ? (
          <FirstSteps
            setup={setup}
            base={base}
            canManageSites={canManageSites}
            canManageGateways={canManageGateways}
          />
        ) : null}
        {setup.sites === 0 ? (
          <Cautions />
        ) : (
          <>
            <dl className="grid grid-cols-2 gap-4 lg:grid-cols-4">
              {stats.map(([k, v]) => (
                <div
                  key={k}
                  className="rounded-card border border-line bg-surface p-4 shadow-card"
                >
                  <dt className="text-sm text-ink-muted">{k}</dt>
                  <dd className="text-2xl font-semibold tabular-nums">{v}</dd>
                </div>
              ))}
            </dl>
            <Card aria-labelledby="carrier-heading">
              <h2 id="carrier-heading" className="text-lg">
                Energy delivered and exported per month
              </h2>
              <p className="text-sm text-ink-muted">
                Boundary meters, by carrier: delivered above zero, exported
                below it. Carriers are shown side by side, never added together.
              </p>
              {byCarrier.length === 0 ? (
                <div className="mt-3">
                  <EmptyState title="No monthly figures yet">
                    They appear as readings arrive.
                  </EmptyState>
                </div>
              ) : mounted ? (
                <CarrierChart data={byCarrier} />
              ) : (
                <div style={{ height: 300 }} />
              )}
            </Card>
            <div className="grid gap-6 lg:grid-cols-2">
              <Card aria-labelledby="drift-heading">
                <h2 id="drift-heading" className="text-lg">
                  Sites that changed most
                </h2>
                <p className="text-sm text-ink-muted">
                  Energy delivered in {month} against the same month a year
                  before, per carrier (boundary import meters; chilled water as
                  cooling delivered): ▲ more, ▼ less; solid beyond ±
                  {DRIFT_TOLERANCE * 100} %.
                </p>
                <table className="mt-3 w-full text-left">
                  <thead className="text-sm text-ink-muted">
                    <tr>
                      <th className="py-1 font-semibold">Site</th>
                      <th className="py-1 font-semibold">Carrier</th>
                      <th className="py-1 text-right font-semibold">
                        Delivered, {month}
                      </th>
                      <th className="py-1 text-right font-semibold">Change</th>
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-line">
                    {drift.map((d) => (
                      <tr
                        key={`${d.site_id}|${d.carrier}`}
                        data-site={d.site_id}
                        data-carrier={d.carrier}
                      >
                        <td className="py-2">
                          <Link
                            className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                            to={`${base}/sites/${d.site_id}`}
                          >
                            {d.site_name}
                          </Link>
                        </td>
                        <td className="py-2">
                          <CarrierBadge carrier={d.carrier} />
                        </td>
                        <td className="py-2 text-right tabular-nums">
                          {kwh(d.delivered_kwh)}
                        </td>
                        <td className="py-2 text-right tabular-nums">
                          <ChangePill
                            change={d.change}
                            tolerance={DRIFT_TOLERANCE}
                          />
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </Card>
              <Card aria-labelledby="silent-heading">
                <h2 id="silent-heading" className="text-lg">
                  Meters with no data
                </h2>
                <p className="text-sm text-ink-muted">
                  No actual reading for more than {silent} hours.{" "}
                  <Link
                    className="underline"
                    to={`?silent=${silent === 24 ? 72 : 24}`}
                  >
                    Show over {silent === 24 ? 72 : 24} h
                  </Link>
                </p>
                {silentList.length === 0 ? (
                  <div className="mt-3">
                    <EmptyState title="Every meter is reporting" />
                  </div>
                ) : (
                  <ul className="mt-2 divide-y divide-line">
                    {silentList.map((m) => (
                      <li
                        key={m.meter_id}
                        className="flex items-center justify-between gap-3 py-2"
                      >
                        <Link
                          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                          to={`${base}/meters/${m.meter_id}/readings`}
                        >
                          <span className="font-mono">{m.code}</span> {m.name}
                          <span className="block text-sm font-normal text-ink-muted">
                            {m.site_name}
                          </span>
                        </Link>
                        <span className="text-sm text-ink-muted">
                          {m.last_hour
                            ? `last ${formatDistanceStrict(new Date(m.last_hour), new Date(now))} ago`
                            : "never"}
                        </span>
                      </li>
                    ))}
                  </ul>
                )}
              </Card>
            </div>
            <AgainstBaseline rows={baselines} month={month} base={base} />
            <AlertSettings
              alerts={alerts}
              errors={actionData?.errors ?? {}}
              saved={actionData?.saved ?? false}
            />
            <Cautions />
          </>
        )}
      </div>
    </>
  );
}
