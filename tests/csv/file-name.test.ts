/**
 * Download names from titles (lib/csv/file-name.ts). Expected names written out by hand from the
 * rule in the function's comment.
 */
import { describe, expect, it } from "vitest";
import { fileSlug } from "../../lib/csv/file-name";

describe("fileSlug", () => {
  it("keeps letters, digits and single dashes, lower case", () => {
    expect(fileSlug("Wren-2 launch year (Quillmoor Instruments)")).toBe("wren-2-launch-year-quillmoor-instruments");
    expect(fileSlug("=1+2: how many Plover-3 gauges in month 15?")).toBe("1-2-how-many-plover-3-gauges-in-month-15");
  });
  it("drops accents and anything that could name a path or break a header", () => {
    expect(fileSlug("Prévisions Señal Ørsted")).toBe("previsions-senal-rsted");
    expect(fileSlug('../../etc/passwd"; x=\r\n')).toBe("etc-passwd-x");
  });
  it("cuts long titles at a dash and falls back when nothing is left", () => {
    expect(fileSlug("Wren-2 soil-moisture sensor shipments to dealers in the northern region", 40)).toBe("wren-2-soil-moisture-sensor-shipments-to");
    expect(fileSlug("???", 40, "panel")).toBe("panel");
    expect(fileSlug("")).toBe("export");
  });
});
