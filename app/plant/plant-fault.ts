/** A month in which a plant broke a law, as alerts and reports carry it. Plain module. */
import type { PlantKind } from "./plant-roles";

export interface PlantFault {
  plantId: string;
  plantName: string;
  kind: PlantKind;
  kindLabel: string;
  siteName: string;
  /** YYYY-MM */
  month: string;
  /** Codes of the plant's meters, one of which reads wrongly. */
  meterCodes: string[];
  text: string;
}
