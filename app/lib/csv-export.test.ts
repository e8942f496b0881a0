import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { toCsv } from "./csv-export";

/** The cells of the one data row under the header, as a CSV reader sees them. */
function cellsOf(csv: string): string[] {
  const { data, errors } = Papa.parse<string[]>(csv.slice(0, -1), {
    delimiter: ",",
    newline: "\n",
  });
  expect(errors).toEqual([]);
  expect(data).toHaveLength(2);
  return data[1];
}

describe("toCsv", () => {
  it.each([
    ["=", '=HYPERLINK("http://evil.example","x")'],
    ["+", "+SUM(1,2)"],
    ["-", "-2+3+cmd|' /C calc'!A0"],
    ["@", "@SUM(1+1)"],
    ["tab", "\t=1+1"],
    ["carriage return", "\r=1+1"],
  ])(
    "a text cell starting with %s opens as text: prefixed with ' and quoted",
    (_, text) => {
      const csv = toCsv(["h"], [[text]]);
      expect(csv).toBe(`h\n"'${text.replaceAll('"', '""')}"\n`);
      expect(cellsOf(csv)).toEqual([`'${text}`]);
    },
  );

  it("catches a formula whose text goes on past a line break", () => {
    // Papaparse's default pattern ends in `.*$`, which stops at "\n".
    const text = "=1+1\nsecond line";
    expect(cellsOf(toCsv(["h"], [[text]]))).toEqual([`'${text}`]);
  });

  it("keeps negative numbers numbers, whether JS numbers or exact decimal text", () => {
    const csv = toCsv(
      ["exports_kwh", "net_kwh", "share", "count"],
      [["-12.500000", "-3", -0.25, -7]],
    );
    expect(csv).toBe(
      "exports_kwh,net_kwh,share,count\n-12.500000,-3,-0.25,-7\n",
    );
  });

  it("still neutralises a minus that begins anything but a plain decimal", () => {
    expect(
      cellsOf(toCsv(["a", "b", "c"], [["-1+2", "-12.5e3", "- 4"]])),
    ).toEqual(["'-1+2", "'-12.5e3", "'- 4"]);
  });

  it("quotes commas, quotes and line breaks and reads back unchanged", () => {
    const row = [
      'Hall "A", east wing',
      "line one\nline two",
      "cr\rlf",
      "plain",
    ];
    const csv = toCsv(["a", "b", "c", "d"], [row]);
    expect(csv).toBe(
      'a,b,c,d\n"Hall ""A"", east wing","line one\nline two","cr\rlf",plain\n',
    );
    expect(cellsOf(csv)).toEqual(row);
  });

  it("leaves text with a formula character later on alone", () => {
    expect(toCsv(["a", "b"], [["Site = main", "ops@site.example"]])).toBe(
      "a,b\nSite = main,ops@site.example\n",
    );
  });

  it("writes null and undefined as empty cells, and only the header for no rows", () => {
    expect(toCsv(["a", "b", "c"], [[null, undefined, 0]])).toBe("a,b,c\n,,0\n");
    expect(toCsv(["a", "b"], [])).toBe("a,b\n");
  });
});
