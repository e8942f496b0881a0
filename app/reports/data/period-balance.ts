/**
 * A site's energy balance over a report's period. The boundary figures per
 * carrier are the ledger's (the tables' totals), so the balance and the
 * tables agree; the net is the thermodynamic view of the same figures, heat
 * and work into the site (cooling delivered is heat leaving it). The
 * sub-meter residuals compare each parent meter with its direct sub-meters
 * from the monthly rollups as they stand, signed as stored. Pure.
 */
import { residualFlag } from "~/ledger/balance";
import { deliveredSign } from "~/ledger/delivered";
import { subtractDecimals, sumDecimals } from "./decimal";
import { carrierReportOrder } from "~/sites/meter-kinds";
import type {
  Carrier,
  CarrierBalance,
  CarrierTable,
  Residual,
  SiteEnergyBalance,
} from "./types";

/** One meter's signed energy summed over the period's rollups. */
export interface MeterPeriodEnergy {
  id: string;
  siteId: string;
  code: string;
  name: string;
  carrier: Carrier;
  parentMeterId: string | null;
  energyKwh: string;
}

export function residuals(meters: readonly MeterPeriodEnergy[]): Residual[] {
  const byId = new Map(meters.map((m) => [m.id, m]));
  const children = new Map<string, MeterPeriodEnergy[]>();
  for (const m of meters) {
    if (!m.parentMeterId || !byId.has(m.parentMeterId)) continue;
    children.set(m.parentMeterId, [
      ...(children.get(m.parentMeterId) ?? []),
      m,
    ]);
  }
  return [...children]
    .map(([parentId, kids]) => {
      const parent = byId.get(parentId)!;
      const childrenKwh = sumDecimals(kids.map((k) => k.energyKwh));
      const residualKwh = subtractDecimals(parent.energyKwh, childrenKwh);
      const parentValue = Number(parent.energyKwh);
      return {
        code: parent.code,
        name: parent.name,
        carrier: parent.carrier,
        parentKwh: parent.energyKwh,
        childrenKwh,
        residualKwh,
        residualFraction:
          parentValue === 0 ? null : Number(residualKwh) / parentValue,
        childCount: kids.length,
        flag: residualFlag(parent.energyKwh, childrenKwh),
      };
    })
    .sort((a, b) => a.code.localeCompare(b.code));
}

export function siteBalanceOf(
  tables: readonly CarrierTable[],
  meters: readonly MeterPeriodEnergy[],
): SiteEnergyBalance {
  const carriers: CarrierBalance[] = [...tables]
    .sort(
      (a, b) =>
        carrierReportOrder.indexOf(a.carrier) -
        carrierReportOrder.indexOf(b.carrier),
    )
    .map((t) => ({
      carrier: t.carrier,
      importsKwh: t.total.importsKwh,
      exportsKwh: t.total.exportsKwh,
      netKwh: t.total.netKwh,
    }));
  return {
    carriers,
    netIntoSiteKwh: sumDecimals(
      carriers.map((c) =>
        deliveredSign(c.carrier) < 0
          ? subtractDecimals("0", c.netKwh)
          : c.netKwh,
      ),
    ),
    residuals: residuals(meters),
  };
}
