/**
 * Posts live readings for the Larchmere demo meters to a running server, as
 * a gateway would: every few seconds, each five-minute interval that has ended since the last post, for
 * each water-heat meter and a register read for each electricity meter.
 *
 *   node --import tsx scripts/gateway-simulator.ts [baseUrl] [--key KEY] [--every SECONDS] [--rounds N]
 *
 * The demo gateway key is the default (development only).
 */
import { parseArgs } from "node:util";
import { METERS } from "../seeds/scenario/larchmere-estate";
import { DEFAULT_DEMO_GATEWAY_KEY } from "../seeds/demo-people";

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: {
    key: {
      type: "string",
      default: process.env.DEMO_GATEWAY_KEY || DEFAULT_DEMO_GATEWAY_KEY,
    },
    every: { type: "string", default: "10" },
    rounds: { type: "string", default: "0" },
  },
});
const base = positionals[0] ?? "http://127.0.0.1:3000";
const everyMs = Math.max(1, Number(values.every)) * 1000;
const rounds = Number(values.rounds);
const FIVE_MIN = 5 * 60_000;

const live = METERS.filter((m) => !m.removedAt);
const registers = new Map<string, number>();

/** Registers continue from where the server's intervals leave off is unknown here, so start high and climb. */
function nextRegister(code: string, kwhPerStep: number): number {
  const value =
    (registers.get(code) ?? 200_000 + Math.random() * 1000) + kwhPerStep;
  registers.set(code, value);
  return Math.round(value * 10) / 10;
}

function readingsFor(end: Date) {
  const start = new Date(end.getTime() - FIVE_MIN);
  const readings: Record<string, unknown>[] = [];
  for (const m of live) {
    if (m.quantity === "water_heat") {
      const cooling = m.carrier === "cooling";
      readings.push({
        meter: m.code,
        quantity: "water_heat",
        start: start.toISOString(),
        end: end.toISOString(),
        volume_m3: Math.round((0.2 + Math.random() * 0.5) * 1000) / 1000,
        flow_temp_c: cooling ? 7 : 72,
        return_temp_c: cooling ? 12 : 48 + Math.random() * 4,
        pressure_bar_abs: 6,
        sensor_at: m.sensorAt ?? "return",
      });
    } else if (m.quantity === "steam_heat") {
      readings.push({
        meter: m.code,
        quantity: "steam_heat",
        start: start.toISOString(),
        end: end.toISOString(),
        mass_kg: 150 + Math.random() * 60,
        pressure_bar_g: 7,
        condensate_temp_c: 92,
      });
    } else if (m.quantity === "electric_register" && !m.rolloverKwh) {
      readings.push({
        meter: m.code,
        quantity: "electric_register",
        time: end.toISOString(),
        register_kwh: nextRegister(m.code, 2 + Math.random() * 3),
      });
    }
  }
  return readings;
}

async function post(end: Date) {
  const response = await fetch(`${base}/api/v1/readings`, {
    method: "POST",
    headers: {
      authorization: `Bearer ${values.key}`,
      "content-type": "application/json",
    },
    body: JSON.stringify({ readings: readingsFor(end) }),
  });
  const body = (await response.json()) as {
    accepted?: number;
    repeats?: number;
    rejected?: unknown[];
    conflicts?: unknown[];
    error?: { message: string };
  };
  if (!response.ok)
    console.error(`[simulator] ${response.status}: ${body.error?.message}`);
  else
    console.log(
      `[simulator] ${end.toISOString()}: ${body.accepted} accepted, ${body.repeats} repeats, ${body.rejected?.length} rejected, ${body.conflicts?.length} conflicts`,
    );
}

let round = 0;
let end = new Date(Math.floor(Date.now() / FIVE_MIN) * FIVE_MIN);
await post(end);
const timer = setInterval(() => {
  round += 1;
  if (rounds > 0 && round >= rounds) clearInterval(timer);
  // Never ahead of the clock: an interval is posted once it has ended.
  const next = new Date(end.getTime() + FIVE_MIN);
  if (next.getTime() > Date.now()) return;
  end = next;
  void post(end);
}, everyMs);
