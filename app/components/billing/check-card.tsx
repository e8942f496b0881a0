import { Form } from "react-router";
import type { BillingActionResult } from "~/billing/billing-words";
import { SectionCard } from "~/components/section-card";
import { Button, Notice } from "~/components/ui";
import { dateTimeUtc } from "~/lib/format";
import { BusyLabel } from "./busy-label";

/** "Check now": that Stripe bills today's metered-site count. */
export function CheckCard({
  lastReconciledAt,
  result,
}: {
  lastReconciledAt: Date | null;
  result?: BillingActionResult;
}) {
  const mine = result?.intent === "reconcile" ? result : undefined;
  return (
    <SectionCard
      headingId="check-heading"
      title="Billed sites"
      className="flex flex-col gap-3"
    >
      <p className="text-ink-muted">
        Joulebook regularly checks that Stripe bills today&apos;s metered-site
        count, and corrects it if not.{" "}
        {lastReconciledAt
          ? `Last checked ${dateTimeUtc(lastReconciledAt)}.`
          : "Not checked yet."}
      </p>
      {mine?.message ? <Notice tone="success">{mine.message}</Notice> : null}
      {mine?.error ? <Notice tone="error">{mine.error}</Notice> : null}
      <Form method="post">
        <input type="hidden" name="intent" value="reconcile" />
        <Button type="submit" variant="secondary">
          <BusyLabel intent="reconcile" idle="Check now" busy="Checking…" />
        </Button>
      </Form>
    </SectionCard>
  );
}
