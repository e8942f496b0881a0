import { Form, useSubmit } from "react-router";
import type { SiteView } from "~/baselines/weather-page.server";
import { LabelledOptions, SiteOptions } from "~/components/options";
import { Button, Card, Field, SelectField } from "~/components/ui";
import { formatCelsius } from "~/lib/format";
import { carrierLabels } from "~/sites/meter-kinds";

/**
 * The page's question: site, carrier, degree days and the two periods. Any
 * change asks again at once (a GET, so the view has its own address); a saved
 * baseline fixes its own degree days and months.
 */
export function WeatherControls({
  view,
  sites,
}: {
  view: SiteView;
  sites: { id: string; name: string }[];
}) {
  const submit = useSubmit();
  const { periods, errors, saved } = view;
  const locked = saved !== null;
  const months = [
    ["Baseline from", "baseFrom", saved ? saved.from : periods.baseFrom],
    ["Baseline to", "baseTo", saved ? saved.to : periods.baseTo],
    ["Reporting from", "reportFrom", periods.reportFrom],
    ["Reporting to", "reportTo", periods.reportTo],
  ] as const;
  return (
    <Card aria-labelledby="controls-heading">
      <h2 id="controls-heading" className="sr-only">
        Site, carrier and periods
      </h2>
      <Form
        key={`${view.site.id}|${view.carrier}|${view.driver}|${Object.values(periods).join("|")}|${saved?.id ?? ""}`}
        method="get"
        preventScrollReset
        onChange={(e) =>
          submit(e.currentTarget, { replace: true, preventScrollReset: true })
        }
        className="grid gap-4 sm:grid-cols-3 lg:grid-cols-4 lg:items-end"
      >
        <SelectField label="Site" name="site" defaultValue={view.site.id}>
          <SiteOptions sites={sites} />
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
          <LabelledOptions values={view.carriers} labels={carrierLabels} />
        </SelectField>
        <SelectField
          label="Degree days"
          name="driver"
          defaultValue={view.driver}
          disabled={locked}
        >
          <option value="hdd">Heating (HDD)</option>
          <option value="cdd">Cooling (CDD)</option>
        </SelectField>
        <div className="hidden lg:block" />
        {months.map(([label, name, value]) => (
          <Field
            key={name}
            label={label}
            name={name}
            type="month"
            defaultValue={value}
            error={errors[name]}
            // The reporting period stays open: savings against a saved
            // baseline can be reckoned for any months.
            disabled={name.startsWith("base") ? locked : undefined}
          />
        ))}
        {saved ? (
          <input type="hidden" name="baseline" value={saved.id} />
        ) : null}
        <noscript>
          <Button type="submit">Show</Button>
        </noscript>
      </Form>
      <p className="mt-3 text-sm text-ink-muted">
        Degree days to a base of{" "}
        {formatCelsius(view.analysis?.baseC ?? view.site.degreeDayBaseC)} (
        {saved ? "the saved baseline's base" : "the site's base"}), summed over
        the days of each month in the site's calendar ({view.site.timeZone}).
        Energy: what the import meters on the site's boundary metered, from the
        ledger.
      </p>
    </Card>
  );
}
