// Number formatting (UI.md "Typography and numbers": minus signs as −, exponents as ×10ⁿ, figures follow the
// uncertainty; common practice of two significant figures in the uncertainty).
import { describe, expect, it } from "vitest";
import { formatNumber, formatSeconds, formatWithUncertainty } from "@/lib/format/number";
import { solutionColour } from "@/lib/colour/wavelength";

describe("formatting", () => {
  it("uses a true minus and ×10ⁿ", () => {
    expect(formatNumber(-0.25)).toBe("−0.25");
    expect(formatNumber(4.8367e-5, 3)).toBe("4.84×10⁻⁵");
    expect(formatNumber(123456)).toBe("1.235×10⁵");
  });
  it("gives the value to the decimal place of a two-figure uncertainty", () => {
    expect(formatWithUncertainty(1.19781, 0.00239)).toBe("1.1978 ± 0.0024");
    expect(formatWithUncertainty(0.004836691, 0.0000319257)).toBe("0.004837 ± 0.000032");
    expect(formatWithUncertainty(4.836691e-5, 3.19257e-7)).toBe("(4.837 ± 0.032)×10⁻⁵");
    expect(formatWithUncertainty(103490.4, 797.7)).toBe("(1.0349 ± 0.0080)×10⁵");
    expect(formatWithUncertainty(2, null)).toBe("2");
  });
  it("writes times in s, min or h", () => {
    expect(formatSeconds(30)).toBe("30 s");
    expect(formatSeconds(900)).toBe("15 min");
  });
  it("colours a channel by the complement of its wavelength (textbook absorbed/observed table)", () => {
    expect(solutionColour(590).seen).toBe("blue");
    expect(solutionColour(405).seen).toBe("yellow-green");
    expect(solutionColour(340).seen).toBeNull();
  });
});

describe("number fields as typed (common practice: a decimal comma is accepted, an empty field is not given)", () => {
  it("reads decimals with a point or a comma, empty as null, and leaves the rest NaN to show as wrong", async () => {
    const { parseDecimalField } = await import("@/lib/format/input");
    expect(parseDecimalField("0,25")).toBe(0.25);
    expect(parseDecimalField(" 1.5e-3 ")).toBe(0.0015);
    expect(parseDecimalField("  ")).toBeNull();
    expect(parseDecimalField("1x")).toBeNaN();
  });
  it("reads and writes start values as name=number pairs", async () => {
    const { formatStartValues, parseStartValues } = await import("@/lib/format/input");
    expect(parseStartValues("k=0.002, b1=1; junk, a = -2e-1")).toEqual({ k: 0.002, b1: 1, a: -0.2 });
    expect(parseStartValues("k=1e")).toEqual({ k: NaN });
    expect(formatStartValues({ k: 0.002, b1: 1 })).toBe("k=0.002, b1=1");
  });
});
