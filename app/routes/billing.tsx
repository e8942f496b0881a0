import { data, redirect } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import {
  describeReconcile,
  type BillingActionResult as ActionResult,
} from "~/billing/billing-words";
import {
  BillingRuleError,
  openBillingPortal,
  startCheckout,
} from "~/billing/checkout.server";
import { billingOverview } from "~/billing/overview.server";
import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import {
  lookUpAfterCheckout,
  reconcileOrganization,
} from "~/billing/reconcile.server";
import { isStripeError } from "~/billing/stripe.server";
import { CheckCard } from "~/components/billing/check-card";
import { CheckoutReturn } from "~/components/billing/checkout-return";
import { EstimateCard } from "~/components/billing/estimate-card";
import { InvoicesCard } from "~/components/billing/invoices-card";
import { MeteredSitesCard } from "~/components/billing/metered-sites-card";
import { PaymentCard } from "~/components/billing/payment-card";
import { PlanCard } from "~/components/billing/plan-card";
import { TrialNote } from "~/components/billing/trial-note";
import { Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { idField } from "~/lib/ids";
import type { Route } from "./+types/billing";

export const meta: Route.MetaFunction = () => [
  { title: "Billing · Joulebook" },
];

const attemptField = idField("Reload the page and try again.");
/** Both send the browser to Stripe: Checkout to subscribe, the portal to manage. */
const goToStripeSchema = z.strictObject({
  intent: z.enum(["subscribe", "portal"]),
  attempt: attemptField,
});
const reconcileSchema = z.strictObject({ intent: z.literal("reconcile") });

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "billing.view");
  const checkout = new URL(request.url).searchParams.get("checkout");
  // Back from a paid Checkout: find the subscription in Stripe now if its
  // webhook has not arrived (or was lost).
  if (checkout === "done") await lookUpAfterCheckout(organization.id);
  return {
    organization,
    ...(await billingOverview(organization.id)),
    canManage: can(role, "billing.manage"),
    checkout: checkout === "done" || checkout === "cancelled" ? checkout : null,
  };
}

const fail = (intent: string, error: string, status: number) =>
  data<ActionResult>({ intent, error }, { status });

async function runIntent(
  intent: string,
  formData: FormData,
  organizationId: string,
) {
  if (intent === "subscribe" || intent === "portal") {
    const form = parseForm(formData, goToStripeSchema);
    if (!form.ok) return fail(intent, Object.values(form.errors)[0], 400);
    const go = intent === "subscribe" ? startCheckout : openBillingPortal;
    throw redirect(
      await go({ organizationId, attempt: form.data.attempt }),
      303,
    );
  }
  if (intent === "reconcile") {
    const form = parseForm(formData, reconcileSchema);
    if (!form.ok) return fail(intent, Object.values(form.errors)[0], 400);
    const outcome = await reconcileOrganization(organizationId);
    if (outcome.result === "failed")
      return fail(intent, describeReconcile(outcome), 502);
    return data<ActionResult>({ intent, message: describeReconcile(outcome) });
  }
  return fail(intent, "Unknown action.", 400);
}

export async function action({ request, context }: Route.ActionArgs) {
  const { organization } = requirePermission(context, "billing.manage");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  try {
    return await runIntent(intent, formData, organization.id);
  } catch (error) {
    if (error instanceof BillingRuleError)
      return fail(intent, error.message, 409);
    if (isStripeError(error)) {
      console.error(`[billing] ${intent} failed:`, error.message);
      return fail(
        intent,
        "The payment service did not answer; nothing was charged or changed. Try again in a minute.",
        502,
      );
    }
    throw error;
  }
}

export default function Billing({
  loaderData: d,
  actionData,
}: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  return (
    <>
      <PageHeader
        title="Billing"
        description={`What ${d.organization.name} pays for Joulebook: ${formatMoney(UNIT_PRICE_MINOR)} per metered site per month, through Stripe.`}
      />
      <div className="flex flex-col gap-6">
        <CheckoutReturn
          checkout={d.checkout}
          subscribed={d.account?.subscribed ?? false}
        />
        {d.serviceProblem ? (
          <Notice tone="error">{d.serviceProblem}</Notice>
        ) : null}
        <div className="grid gap-6 lg:grid-cols-3">
          <PlanCard standing={d.standing} account={d.account} />
          <MeteredSitesCard orgId={d.organization.id} sites={d.meteredSites} />
          <EstimateCard estimate={d.estimate} account={d.account} />
        </div>
        {d.canManage ? (
          <div className="grid gap-6 lg:grid-cols-2">
            <PaymentCard
              account={d.account}
              estimate={d.estimate}
              attempt={d.attempt}
              result={result}
            />
            {/* Only a subscription has a quantity to check. */}
            {d.account?.stripeSubscriptionId ? (
              <CheckCard
                lastReconciledAt={d.account.lastReconciledAt}
                result={result}
              />
            ) : (
              <TrialNote graceDays={d.graceDays} />
            )}
          </div>
        ) : null}
        <InvoicesCard invoices={d.invoices} />
      </div>
    </>
  );
}
