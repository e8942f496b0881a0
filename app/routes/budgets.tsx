import { data, Form, useActionData } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import {
  budgetFormSchema,
  carbonTargetFormSchema,
} from "~/budgets/budget-schema";
import {
  getCarbonTarget,
  listBudgets,
  saveBudget,
  saveCarbonTarget,
} from "~/budgets/budgets.server";
import { financialYearLabel } from "~/financial-year/financial-year";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { SectionCard } from "~/components/section-card";
import {
  Button,
  EmptyState,
  Field,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import {
  decimalAsTyped,
  formatCost,
  formatNumber,
  NO_FIGURE,
} from "~/lib/format";
import { parseForm } from "~/lib/forms";
import { listSites } from "~/sites/sites.server";
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import type { Route } from "./+types/budgets";

export const meta: Route.MetaFunction = () => [
  { title: "Budgets · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "ledger.view");
  const [budgets, target, startMonth, sites] = await Promise.all([
    listBudgets(organization.id),
    getCarbonTarget(organization.id),
    financialYearStart(organization.id),
    listSites({ organizationId: organization.id }),
  ]);
  return {
    budgets,
    target,
    startMonth,
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
    canManage: can(role, "carbon.manage"),
  };
}

type Result = { errors: Record<string, string>; saved?: string };

/** Owners and energy managers set budgets and the target; each save is audited. */
export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "carbon.manage");
  const formData = await request.formData();
  const actor = { organizationId: organization.id, actorUserId: user.id };
  if (formData.get("intent") === "target") {
    const form = parseForm(formData, carbonTargetFormSchema);
    if (!form.ok) return data<Result>({ errors: form.errors }, { status: 400 });
    await saveCarbonTarget(actor, form.data);
    return { errors: {}, saved: "The carbon target is saved." } as Result;
  }
  const form = parseForm(formData, budgetFormSchema);
  if (!form.ok) return data<Result>({ errors: form.errors }, { status: 400 });
  const outcome = await saveBudget(actor, form.data);
  if (!outcome.ok)
    return data<Result>(
      { errors: { [outcome.field]: outcome.reason } },
      { status: 400 },
    );
  return { errors: {}, saved: "The budget is saved." } as Result;
}

export default function Budgets({ loaderData }: Route.ComponentProps) {
  const { budgets, target, startMonth, sites, canManage } = loaderData;
  const result = useActionData<typeof action>() as Result | undefined;
  const errors = result?.errors ?? {};
  const thisYear = new Date().getUTCFullYear();
  return (
    <>
      <PageHeader
        title="Budgets and the carbon target"
        description="A budget per site, carrier and financial year in kWh and money, spread over the months flat or by the site's heating degree days of the year before. The Overview sets the year's actuals against them."
      />
      <div className="flex flex-col gap-6">
        {result?.saved ? <Notice tone="success">{result.saved}</Notice> : null}
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <SectionCard headingId="budget-list" title="Budgets">
          {budgets.length === 0 ? (
            <EmptyState title="No budgets yet">
              Owners and energy managers set them below.
            </EmptyState>
          ) : (
            <table className="w-full text-sm">
              <thead>
                <tr className="text-left">
                  <th>Year</th>
                  <th>Site</th>
                  <th>Carrier</th>
                  <th className="text-right">kWh</th>
                  <th className="text-right">Money</th>
                  <th>Spread</th>
                </tr>
              </thead>
              <tbody>
                {budgets.map((b) => (
                  <tr key={b.id}>
                    <td>{financialYearLabel(b.financial_year, startMonth)}</td>
                    <td>{b.site_name}</td>
                    <td>{carrierLabels[b.carrier]}</td>
                    <td className="text-right">
                      {formatNumber(Number(b.energy_kwh), 0)}
                    </td>
                    <td className="text-right">
                      {b.amount && b.currency
                        ? formatCost(b.amount, b.currency)
                        : NO_FIGURE}
                    </td>
                    <td>{b.spread === "flat" ? "Flat" : "Degree days"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </SectionCard>
        {canManage ? (
          <SectionCard headingId="budget-form" title="Set a budget">
            <Form method="post" className="grid gap-3 sm:grid-cols-4">
              <input type="hidden" name="intent" value="budget" />
              <SelectField label="Site" name="site_id" error={errors.site_id}>
                {sites.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </SelectField>
              <SelectField
                label="Carrier"
                name="carrier"
                error={errors.carrier}
              >
                {carriers.map((c) => (
                  <option key={c} value={c}>
                    {carrierLabels[c]}
                  </option>
                ))}
              </SelectField>
              <Field
                label="Financial year (starting)"
                name="financial_year"
                defaultValue={thisYear}
                error={errors.financial_year}
              />
              <SelectField label="Spread" name="spread" error={errors.spread}>
                <option value="flat">Flat</option>
                <option value="degree_days">By degree days</option>
              </SelectField>
              <Field label="kWh" name="energy_kwh" error={errors.energy_kwh} />
              <Field label="Money" name="amount" error={errors.amount} />
              <Field
                label="Currency"
                name="currency"
                defaultValue="GBP"
                error={errors.currency}
              />
              <div className="flex items-end">
                <Button type="submit">Save budget</Button>
              </div>
            </Form>
          </SectionCard>
        ) : null}
        <SectionCard headingId="target" title="Carbon target">
          <p className="text-sm text-ink-muted">
            {target
              ? `${decimalAsTyped(target.reduction_percent)} % below ${financialYearLabel(target.base_year, startMonth)} by ${financialYearLabel(target.target_year, startMonth)}, ${target.basis}-based CO₂e of all carriers.`
              : "No carbon target yet."}
          </p>
          {canManage ? (
            <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-5">
              <input type="hidden" name="intent" value="target" />
              <Field
                label="Base year (starting)"
                name="base_year"
                defaultValue={target?.base_year ?? thisYear - 1}
                error={errors.base_year}
              />
              <Field
                label="Target year (starting)"
                name="target_year"
                defaultValue={target?.target_year ?? thisYear}
                error={errors.target_year}
              />
              <Field
                label="Reduction %"
                name="reduction_percent"
                defaultValue={target?.reduction_percent ?? "10"}
                error={errors.reduction_percent}
              />
              <SelectField label="Basis" name="basis" error={errors.basis}>
                <option value="location">Location-based</option>
                <option value="market">Market-based</option>
              </SelectField>
              <div className="flex items-end">
                <Button type="submit">Save target</Button>
              </div>
            </Form>
          ) : null}
        </SectionCard>
      </div>
    </>
  );
}
