import { describe, expect, it } from "vitest";
import {
  MAX_DELAY_MS,
  nextRestart,
  STABLE_AFTER_MS,
  type RestartState,
} from "./restart-backoff";

describe("restarting a server process that died", () => {
  it("replaces one that had served a while at once", () => {
    expect(nextRestart({ quickDeaths: 4 }, STABLE_AFTER_MS)).toEqual({
      state: { quickDeaths: 0 },
      delayMs: 0,
    });
  });

  it("doubles the wait for each quick death in a row, up to a minute", () => {
    let state: RestartState = { quickDeaths: 0 };
    const delays: number[] = [];
    for (let i = 0; i < 10; i++) {
      const next = nextRestart(state, 1_000);
      state = next.state;
      delays.push(next.delayMs);
    }
    expect(delays.slice(0, 5)).toEqual([500, 1000, 2000, 4000, 8000]);
    expect(delays.at(-1)).toBe(MAX_DELAY_MS);
    expect(Math.max(...delays)).toBe(MAX_DELAY_MS);
  });
});
