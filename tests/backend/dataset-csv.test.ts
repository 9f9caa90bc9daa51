import { describe, expect, it } from "vitest";
import { parseCsvRecords } from "@backend/services/dataset-files";

const refusal = (fn: () => unknown) => {
  try {
    fn();
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error("no refusal");
};

describe("parseCsvRecords", () => {
  it("keeps a blank line as a record, so row numbers match a spreadsheet's", () => {
    expect(parseCsvRecords("a,b\n\n1,2\n", ",", 100).records).toEqual([["a", "b"], [""], ["1", "2"]]);
  });

  it("reads CRLF, LF and CR line ends in one file, and line breaks inside quotes", () => {
    expect(parseCsvRecords('a,b\r\n1,"x\ny"\n2,3\r4', ",", 100).records).toEqual([["a", "b"], ["1", "x\ny"], ["2", "3"], ["4"]]);
  });

  it("unquotes fields with delimiters and doubled quotes, spaces around them allowed", () => {
    expect(parseCsvRecords('a, "1,5" ,"say ""hi"""\n', ",", 100).records).toEqual([["a", "1,5", 'say "hi"']]);
  });

  it("keeps a quote inside an unquoted field as text", () => {
    expect(parseCsvRecords('x,ab"c,d\n', ",", 100).records).toEqual([["x", 'ab"c', "d"]]);
  });

  it("splits on the delimiter it is given: semicolon and tab", () => {
    expect(parseCsvRecords("a;1,5\nb;2", ";", 100).records).toEqual([
      ["a", "1,5"],
      ["b", "2"],
    ]);
    expect(parseCsvRecords("a\t\tc\n", "\t", 100).records).toEqual([["a", "", "c"]]);
  });

  it("says when there are more records than the limit", () => {
    expect(parseCsvRecords("1\n2\n3\n", ",", 3)).toEqual({ records: [["1"], ["2"], ["3"]], more: false });
    expect(parseCsvRecords("1\n2\n3\n4\n", ",", 3)).toEqual({ records: [["1"], ["2"], ["3"]], more: true });
  });

  it("names the row and column of a quote left open or followed by text", () => {
    expect(refusal(() => parseCsvRecords('a,b\n1,2\n3,"open\n4,5\n', ",", 100))).toMatch(/^Row 3, column B: a quoted field is not closed/);
    expect(refusal(() => parseCsvRecords('a,b,c\n1,2,"x"y\n', ",", 100))).toMatch(
      /^Row 2, column C: text after the closing quote of a quoted field/,
    );
  });
});
