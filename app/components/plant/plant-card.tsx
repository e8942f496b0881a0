import { Form, Link } from "react-router";
import { BrowserOnly } from "~/components/browser-only";
import { FigureTable } from "~/components/figure-table";
import { SectionCard } from "~/components/section-card";
import { Badge, Button } from "~/components/ui";
import {
  DECIMALS,
  formatNumber,
  formatPercent,
  monthLong,
  NO_FIGURE,
} from "~/lib/format";
import type { PlantMonthFigures } from "~/plant/plant-months.server";
import type { PlantFigureKey } from "~/plant/plant-performance";
import {
  plantKindLabels,
  plantMeterRoleLabels,
  rolesOf,
  type PlantKind,
  type PlantMeterRole,
} from "~/plant/plant-roles";
import {
  formatPlantFigure,
  plantFaultText,
  plantFigureLabels,
} from "~/plant/plant-words";
import { PlantChart } from "./plant-chart";

export interface PlantView {
  id: string;
  name: string;
  kind: PlantKind;
  meters: { role: PlantMeterRole; meterId: string; code: string }[];
  months: PlantMonthFigures[];
}

/** The figure each kind is judged by first. */
const mainFigure: Record<PlantKind, PlantFigureKey> = {
  boiler: "efficiency_gross",
  chp: "efficiency_gross",
  fuel_cell: "electrical_efficiency_gross",
  heat_pump: "cop",
  chiller: "eer",
};

const figureOf = (m: PlantMonthFigures, key: PlantFigureKey) =>
  m.performance?.figures.find((f) => f.key === key)?.value ?? null;
const limitOf = (m: PlantMonthFigures, key: PlantFigureKey) =>
  m.performance?.checks.find((c) => c.figure === key)?.limit ?? null;

function figuresShown(kind: PlantKind): PlantFigureKey[] {
  const keys: PlantFigureKey[] =
    kind === "chp" || kind === "fuel_cell"
      ? ["electrical_efficiency_gross", "efficiency_gross"]
      : [mainFigure[kind]];
  return [...keys, "second_law_efficiency"];
}

function MonthRows({ plant }: { plant: PlantView }) {
  const roles = rolesOf[plant.kind];
  const keys = figuresShown(plant.kind);
  return (
    <FigureTable
      bordered
      maxHeight="max-h-96"
      caption={`${plant.name} by month`}
      columns={[
        { label: "Month" },
        ...roles.map((r) => ({
          label: `${plantMeterRoleLabels[r]} (kWh)`,
          align: "right" as const,
        })),
        ...keys.map((k) => ({
          label: plantFigureLabels[k],
          align: "right" as const,
        })),
        { label: "Estimated", align: "right" },
        { label: "Check" },
      ]}
    >
      {plant.months.map((m) => (
        <tr
          key={m.month}
          data-month={m.month}
          className="border-t border-line tabular-nums"
        >
          <td className="px-2 py-1 whitespace-nowrap">{monthLong(m.month)}</td>
          {roles.map((r) => (
            <td key={r} className="px-2 py-1 text-right">
              {m.energies[r] === undefined
                ? "No data"
                : formatNumber(m.energies[r], DECIMALS.kWh)}
            </td>
          ))}
          {keys.map((k) => (
            <td key={k} className="px-2 py-1 text-right">
              {formatPlantFigure(k, figureOf(m, k))}
            </td>
          ))}
          <td className="px-2 py-1 text-right">
            {formatPercent(m.estimatedShare)}
          </td>
          <td className="px-2 py-1" data-plant-check>
            {m.performance === null ? (
              <span className="text-ink-muted">Incomplete: {NO_FIGURE}</span>
            ) : m.faults.length > 0 ? (
              <span className="font-semibold text-danger-700">
                {m.faults.map((f) => plantFaultText(plant.kind, f)).join(" ")}
              </span>
            ) : (
              "Within the laws"
            )}
          </td>
        </tr>
      ))}
    </FigureTable>
  );
}

export function PlantCard({
  plant,
  orgId,
  canManage,
}: {
  plant: PlantView;
  orgId: string;
  canManage: boolean;
}) {
  const key = mainFigure[plant.kind];
  const faultMonths = plant.months.filter((m) => m.faults.length > 0).length;
  return (
    <SectionCard
      headingId={`plant-${plant.id}`}
      title={
        <>
          {plant.name}{" "}
          <span className="text-base font-normal text-ink-muted">
            {plantKindLabels[plant.kind]}
          </span>{" "}
          {faultMonths > 0 ? (
            <Badge tone="danger">
              {`${faultMonths === 1 ? "1 month" : `${faultMonths} months`} with a metering fault`}
            </Badge>
          ) : null}
        </>
      }
    >
      <p className="mt-1 text-sm text-ink-muted">
        {plant.meters.map((m, i) => (
          <span key={m.meterId}>
            {i > 0 ? " · " : ""}
            {plantMeterRoleLabels[m.role]}:{" "}
            <Link
              className="font-mono text-spruce-700 hover:underline"
              to={`/o/${orgId}/meters/${m.meterId}`}
            >
              {m.code}
            </Link>
          </span>
        ))}
      </p>
      {plant.months.length === 0 ? (
        <p className="mt-3">No data from this plant's meters yet.</p>
      ) : (
        <>
          <BrowserOnly>
            <PlantChart
              figure={key}
              months={plant.months.map((m) => ({
                month: m.month,
                value: figureOf(m, key),
                limit: limitOf(m, key),
                fault: m.faults.length > 0,
              }))}
            />
          </BrowserOnly>
          <div className="mt-3">
            <MonthRows plant={plant} />
          </div>
        </>
      )}
      {canManage ? (
        <details className="mt-3">
          <summary className="cursor-pointer font-semibold text-spruce-700">
            Archive this plant…
          </summary>
          <Form
            method="post"
            className="mt-2 flex flex-wrap items-center gap-3"
          >
            <input type="hidden" name="intent" value="archive-plant" />
            <input type="hidden" name="plantId" value={plant.id} />
            <p className="text-sm">
              Its meters and their data stay; only the checks stop.
            </p>
            <Button type="submit" variant="danger">
              Archive {plant.name}
            </Button>
          </Form>
        </details>
      ) : null}
    </SectionCard>
  );
}
