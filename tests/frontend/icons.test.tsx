import { describe, expect, it } from "vitest";
import { render } from "@testing-library/react";
import { CloseIcon, PlusIcon } from "@frontend/components/ui/icons";

describe("icons", () => {
  it("draw at 16 px with a 1.5 px line, hidden from assistive technology", () => {
    const { container } = render(<PlusIcon />);
    const svg = container.querySelector("svg")!;
    expect(svg.getAttribute("width")).toBe("16");
    expect(svg.getAttribute("height")).toBe("16");
    expect(svg.getAttribute("aria-hidden")).toBe("true");
    expect(svg.getAttribute("stroke")).toBe("currentColor");
    // absolute stroke: 1.5 px on the 24-unit grid drawn at 16 px
    expect(Number(svg.getAttribute("stroke-width"))).toBeCloseTo((1.5 * 24) / 16, 5);
    expect(svg.querySelectorAll("path").length).toBeGreaterThan(0);
  });

  it("take the caller's size and classes", () => {
    const { container } = render(<CloseIcon size={14} className="text-fail" />);
    const svg = container.querySelector("svg")!;
    expect(svg.getAttribute("width")).toBe("14");
    expect(svg.getAttribute("class")).toContain("text-fail");
  });
});
