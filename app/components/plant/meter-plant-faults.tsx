import { Link } from "react-router";
import { Notice } from "~/components/ui";
import { monthLong } from "~/lib/format";
import type { PlantFault } from "~/plant/plant-fault";

/** On a meter's page: the months a plant it serves broke a law, since it may be the meter at fault. */
export function MeterPlantFaults({
  faults,
  plantsLink,
}: {
  faults: PlantFault[];
  plantsLink: string;
}) {
  if (faults.length === 0) return null;
  return (
    <Notice tone="error" title="Possible metering fault">
      <ul className="flex list-disc flex-col gap-1 pl-5">
        {faults.map((f) => (
          <li key={`${f.plantId}-${f.month}-${f.text}`}>
            {f.plantName}, {monthLong(f.month)}: {f.text}
          </li>
        ))}
      </ul>
      <p className="mt-2">
        <Link to={plantsLink} className="font-semibold underline">
          See the plant's months
        </Link>
      </p>
    </Notice>
  );
}
