import { describe, expect, it } from "vitest";
import { columnWindow } from "../../../src/components/editor/GridArea";

describe("column windowing", () => {
  const view = { left: 0, width: 800, cell: 28, head: 120 };
  it("renders everything when nothing is measured (server rendering, tests without layout)", () => {
    expect(columnWindow(null, 512, 16, 0)).toEqual({ first: 0, last: 511 });
    expect(columnWindow({ ...view, width: 0 }, 512, 16, 0)).toEqual({ first: 0, last: 511 });
  });

  it("keeps the visible columns and a margin, in whole bars", () => {
    // 800 px wide, 120 px of row names, 28 px cells: columns 0–24 visible, +24 margin → 48, widened to bar 4's end.
    expect(columnWindow(view, 512, 16, 0)).toEqual({ first: 0, last: 63 });
    // Scrolled to x = 2800 (column 100): 76–149 with the margin, widened to bars 5–10.
    expect(columnWindow({ ...view, left: 2800 }, 512, 16, 100)).toEqual({ first: 64, last: 159 });
  });

  it("always includes the cursor's column, so keyboard focus can reach it", () => {
    expect(columnWindow(view, 512, 16, 500)).toEqual({ first: 0, last: 511 });
    expect(columnWindow({ ...view, left: 2800 }, 512, 16, 3)).toEqual({ first: 0, last: 159 });
  });
});
