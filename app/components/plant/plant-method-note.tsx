import { SectionCard } from "~/components/section-card";

/** How the plant figures are worked out: the thermodynamics, kept to a note. */
export function PlantMethodNote() {
  return (
    <SectionCard
      headingId="plant-method-heading"
      title="How these figures are worked out"
    >
      <div
        data-method-note
        className="mt-2 flex max-w-prose flex-col gap-2 text-sm text-ink-muted"
      >
        <p>
          Each plant is a system inside the site's boundary. Its month is the
          sum of its meters' monthly totals: fuel or electricity in, heat,
          cooling or electricity out.
        </p>
        <p>
          <strong>First law</strong> (energy is conserved): a boiler, CHP or
          fuel cell cannot give out more than the gross (higher) calorific
          energy of its fuel. Efficiencies are shown on the gross basis; a plant
          whose fuel meters are on the net basis is converted with the fuel's
          net-to-gross ratio.
        </p>
        <p>
          <strong>Second law</strong>: electricity made from a fuel cannot
          exceed the fuel's maximum work, |ΔG| of its reaction at 25 °C (83.0 %
          of gross for hydrogen, 91.9 % for methane). A heat pump's COP cannot
          exceed the Carnot COP between the month's mean outdoor temperature and
          the mean temperature of the water it heats; a chiller's EER likewise.
          Exergy efficiency is the work value out over the work value in, with
          the month's mean outdoor temperature as the dead state.
        </p>
        <p>
          A month that breaks either law is flagged as a metering fault on the
          plant's meters, never shown as an achievement. Sources: CODATA key
          values (Cox, Wagman &amp; Medvedev 1989) for hydrogen; the Carnot COP
          as in any thermodynamics text.
        </p>
      </div>
    </SectionCard>
  );
}
