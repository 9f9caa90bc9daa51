/** Coordinates as the 3D view's toolbar, caption and tooltip write them (fixed decimals, so they do not jump); every other number: shared/format.ts. */

export const fmt = (v: number, digits = 2) => v.toFixed(digits);
export const fmtMm = (v: number) => `${v.toFixed(2)} mm`;

/** The exaggeration slider is logarithmic from ×1 to ×200, snapping to round factors. */
export const MAX_EXAGGERATION = 200;
export const toSlider = (k: number) => (100 * Math.log(k)) / Math.log(MAX_EXAGGERATION);
export const fromSlider = (t: number) => {
  const k = Math.pow(MAX_EXAGGERATION, t / 100);
  return k < 10 ? Math.round(k * 2) / 2 : k < 50 ? Math.round(k) : Math.round(k / 5) * 5;
};
export const EXAGGERATION_STOPS = [1, 10, 50, 200];

/** "x ≤ 1.20" or "y ≥ …": which side of the section plane is kept. */
export const sectionSign = (axis: "off" | "x" | "y", flip: boolean) => (flip !== (axis === "y") ? "≥" : "≤");
