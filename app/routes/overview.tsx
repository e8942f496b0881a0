import { data } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import { AgainstBaseline } from "~/components/overview/against-baseline";
import { BudgetOverview } from "~/components/budgets/budget-overview";
import { overviewBudgets } from "~/budgets/overview-budgets.server";
import { AlertSettings } from "~/components/overview/alert-settings";
import { EnergyByMonth } from "~/components/overview/energy-by-month";
import { EstateStats } from "~/components/overview/estate-stats";
import { FirstSteps } from "~/components/overview/first-steps";
import { MetersWithoutData } from "~/components/overview/meters-without-data";
import { SitesThatChanged } from "~/components/overview/site-drift";
import { PageHeader } from "~/components/ui";
import {
  alertPreferences,
  saveAlertPreferences,
} from "~/alerts/alert-settings.server";
import { NO_DATA_AFTER_HOURS } from "~/alerts/no-data";
import { parseForm } from "~/lib/forms";
import { estateOverview } from "~/overview/overview-page.server";
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
    .catch(NO_DATA_AFTER_HOURS),
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
  const estate = await estateOverview(organization.id, {
    silentHours: silent,
    now,
  });
  const alerts = await alertPreferences(organization.id, user.id, role);
  const budgets = await overviewBudgets(organization.id, now);
  return {
    organization,
    month: estate.month,
    setup: estate.setup,
    canManageSites: can(role, "sites.manage"),
    canManageGateways: can(role, "gateways.manage"),
    drift: estate.drift,
    silentList: estate.silentList,
    silent,
    complete: estate.complete,
    byCarrier: estate.byCarrier,
    baselines: estate.baselines,
    now: now.toISOString(),
    alerts,
    budgets,
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
  plantFault: checkbox,
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
    budgets,
  } = loaderData;
  const base = `/o/${organization.id}`;
  // Until readings arrive, the first steps lead the page; an organisation
  // that uploads readings without a gateway no longer sees them once it has.
  const showSteps =
    setup.sites === 0 ||
    setup.meters === 0 ||
    (setup.gateways === 0 && byCarrier.length === 0);
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
            <EstateStats
              sites={setup.sites}
              measuredShare={complete.measuredShare}
              estimatedShare={complete.estimatedShare}
              silentHours={silent}
              silentMeters={silentList.length}
            />
            <EnergyByMonth months={byCarrier} />
            {budgets ? <BudgetOverview budgets={budgets} /> : null}
            <div className="grid gap-6 lg:grid-cols-2">
              <SitesThatChanged rows={drift} month={month} base={base} />
              <MetersWithoutData
                meters={silentList}
                hours={silent}
                now={now}
                base={base}
              />
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
