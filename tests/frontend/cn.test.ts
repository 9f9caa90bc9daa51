import { describe, expect, it } from "vitest";
import { cn } from "@frontend/lib/cn";

describe("cn", () => {
  it("joins class names and skips falsy parts", () => {
    expect(cn("a", false, null, undefined, "", "b")).toBe("a b");
    expect(cn("flex", { hidden: false, "opacity-60": true })).toBe("flex opacity-60");
  });

  it("lets a caller's class win over a default of the same kind", () => {
    expect(cn("py-10 px-6", "py-4")).toBe("px-6 py-4");
    expect(cn("text-ink/60", "text-fail")).toBe("text-fail");
    expect(cn("relative", "absolute")).toBe("absolute");
  });

  it("keeps a size and a colour side by side, our 2xs size included", () => {
    expect(cn("text-2xs", "text-ink")).toBe("text-2xs text-ink");
    expect(cn("text-xs", "text-2xs")).toBe("text-2xs");
    expect(cn("text-[13px]", "text-paper")).toBe("text-[13px] text-paper");
  });
});
