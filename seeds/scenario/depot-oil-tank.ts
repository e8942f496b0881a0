/**
 * The demo's oil tank (all invented): a 3,500-litre gas-oil tank feeding the
 * standby boiler at Depot & Laundry, dipped every Monday morning over the
 * scenario's two years, with a delivery whenever the stock runs low. The
 * standby boiler is test-fired weekly and carries part of the load in cold
 * weeks, so the tank empties faster in winter. The dips and deliveries are
 * made consistent here (every week's consumption is positive) and go through
 * the app's own tank write path (app/tanks/tanks.server.ts), which checks
 * the balance and spreads each week's energy over the meter's hours
 * (seeds/seed-depot-oil-tank.ts). Pure, so tests can check the history.
 */
import type { StoredDip } from "../../app/tanks/tanks.server";
import type { TankDelivery } from "../../app/tanks/tank-balance";
import { SCENARIO_PERIOD } from "./larchmere-estate";
import { hashSeed, mulberry32, type Random } from "./prng";

export const OIL_TANK = {
  code: "DL-OT1",
  name: "Standby boiler oil tank",
  capacityL: 3500,
  densityKgL: "0.845",
  calorificValueMjKg: "45.6",
} as const;

const WEEK_MS = 7 * 86_400_000;
/** A delivery is ordered when a week would end below this. */
const REORDER_BELOW_L = 900;
/** Tankers fill to about this, leaving ullage. */
const FILL_TO_L = 3300;

/** Litres burnt in the week starting at `monday`: the weekly test, more in winter. */
function weeklyUse(monday: Date, random: Random): number {
  const month = monday.getUTCMonth();
  const winter = [11, 0, 1].includes(month)
    ? 200
    : [10, 2].includes(month)
      ? 80
      : 0;
  return Math.round(18 + winter * (0.6 + 0.8 * random()));
}

/** Every Monday at 08:00 UTC in the scenario's period. */
function dipTimes(): Date[] {
  const first = new Date(SCENARIO_PERIOD.from);
  // 2024-12-01 is a Sunday: the first dip is the next morning.
  first.setUTCDate(first.getUTCDate() + ((8 - first.getUTCDay()) % 7));
  first.setUTCHours(8);
  const times: Date[] = [];
  for (let t = first.getTime(); t < SCENARIO_PERIOD.to.getTime(); t += WEEK_MS)
    times.push(new Date(t));
  return times;
}

/** The tank's weekly dips and the deliveries between them. */
export function oilTankHistory(): {
  dips: StoredDip[];
  deliveries: TankDelivery[];
} {
  const random = mulberry32(hashSeed(OIL_TANK.code));
  const times = dipTimes();
  let stock = 2800;
  const dips: StoredDip[] = [
    { time: times[0], stockL: String(stock), note: "" },
  ];
  const deliveries: TankDelivery[] = [];
  for (const time of times.slice(1)) {
    const use = weeklyUse(new Date(time.getTime() - WEEK_MS), random);
    if (stock - use < REORDER_BELOW_L) {
      // Delivered on the Wednesday before the dip, in whole 100 litres.
      const volume = Math.floor((FILL_TO_L - stock + use) / 100) * 100;
      deliveries.push({
        time: new Date(time.getTime() - 5 * 86_400_000 + 3 * 3_600_000),
        volumeL: String(volume),
        densityKgL: (0.842 + 0.006 * random()).toFixed(3),
        calorificValueMjKg: (45.4 + 0.4 * random()).toFixed(2),
      });
      stock += volume;
    }
    stock -= use;
    dips.push({ time, stockL: String(stock), note: "" });
  }
  return { dips, deliveries };
}
