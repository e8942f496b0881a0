import {
  CarrierChart,
  type CarrierMonth,
} from "~/components/overview/carrier-chart";
import { BrowserOnly } from "~/components/browser-only";
import { SectionCard } from "~/components/section-card";
import { EmptyState } from "~/components/ui";

/** The estate's delivered and exported energy per month, by carrier. */
export function EnergyByMonth({ months }: { months: CarrierMonth[] }) {
  return (
    <SectionCard
      headingId="carrier-heading"
      title="Energy delivered and exported per month"
    >
      <p className="text-sm text-ink-muted">
        Boundary meters, by carrier: delivered above zero, exported below it.
        Carriers are shown side by side, never added together.
      </p>
      {months.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="No monthly figures yet">
            They appear as readings arrive.
          </EmptyState>
        </div>
      ) : (
        // The server keeps the chart's place.
        <BrowserOnly fallback={<div style={{ height: 300 }} />}>
          <CarrierChart data={months} />
        </BrowserOnly>
      )}
    </SectionCard>
  );
}
