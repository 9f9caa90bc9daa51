/** shared/palette.ts is the one source of colour: the Tailwind theme file is written from it. */
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { KIND_COLOUR, PALETTE, themeCss } from "@shared/palette";

const read = (path: string) => readFileSync(new URL(`../../${path}`, import.meta.url), "utf8");

describe("palette", () => {
  it("frontend/styles/palette.css is what `npm run palette` writes from shared/palette.ts", () => {
    expect(read("frontend/styles/palette.css")).toBe(themeCss());
    expect(read("frontend/styles/app.css")).toContain('@import "./palette.css";');
  });

  it("leaves no palette colour written out again in the theme, the charts, the 3D view or the PDF", () => {
    const files = [
      "frontend/styles/app.css",
      "frontend/features/studies/components/chart-theme.ts",
      "frontend/features/viewer3d/lib/palette.ts",
      "backend/services/pdf-draw.ts",
    ];
    for (const file of files) {
      const text = read(file).toLowerCase();
      for (const hex of Object.values(PALETTE)) expect(text, `${file} repeats ${hex}`).not.toContain(hex);
    }
  });

  it("gives every element kind a palette colour", () => {
    for (const colour of Object.values(KIND_COLOUR)) expect(Object.values(PALETTE)).toContain(colour);
  });
});
