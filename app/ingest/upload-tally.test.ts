import { describe, expect, it } from "vitest";
import { addChunkAnswer, chunksOf, emptyTally } from "./upload-tally";

describe("chunksOf", () => {
  it("splits into chunks of the given size with their offsets, the last one short", () => {
    const chunks = [...chunksOf([1, 2, 3, 4, 5], 2)];
    expect(chunks).toEqual([
      { offset: 0, items: [1, 2] },
      { offset: 2, items: [3, 4] },
      { offset: 4, items: [5] },
    ]);
  });
});

describe("addChunkAnswer", () => {
  it("adds the counts and ties each refusal to the file row of its reading", () => {
    const rows = [2, 2, 3, 3, 4];
    let tally = emptyTally(5);
    tally = addChunkAnswer(
      tally,
      { offset: 0, size: 3 },
      {
        accepted: 2,
        repeats: 0,
        rejected: [{ index: 2, meter: "M", reason: "start: bad" }],
        conflicts: [],
      },
      (i) => rows[i],
    );
    tally = addChunkAnswer(
      tally,
      { offset: 3, size: 2 },
      {
        accepted: 0,
        repeats: 1,
        rejected: [],
        conflicts: [{ index: 1, reason: "differs" }],
      },
      (i) => rows[i],
    );
    expect(tally).toEqual({
      total: 5,
      sent: 5,
      accepted: 2,
      alreadyStored: 1,
      refused: [
        { row: 3, meter: "M", reason: "start: bad" },
        { row: 4, meter: undefined, reason: "differs" },
      ],
    });
  });
});
