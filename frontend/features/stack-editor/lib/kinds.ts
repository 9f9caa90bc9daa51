import type { ElementKind } from "@shared/schemas/stack-file";

/** DESIGN.md's palette per element kind (the theme's colour variables). */
export const KIND_COLOR: Record<ElementKind, string> = {
  board: "var(--color-board)",
  substrate: "var(--color-substrate)",
  asic: "var(--color-asic)",
  spacer: "var(--color-line)",
  gyro: "var(--color-gyro)",
  accel: "var(--color-accel)",
  mag: "var(--color-mag)",
};

export const KIND_NAME: Record<ElementKind, string> = {
  board: "Board",
  substrate: "Substrate",
  asic: "ASIC",
  spacer: "Spacer",
  gyro: "Gyroscope die",
  accel: "Accelerometer die",
  mag: "Magnetometer die",
};

export const KIND_SHORT: Record<ElementKind, string> = {
  board: "board",
  substrate: "substrate",
  asic: "ASIC",
  spacer: "spacer",
  gyro: "gyroscope",
  accel: "accelerometer",
  mag: "magnetometer",
};

export const STAGE_LABEL: Record<string, string> = {
  die: "Die",
  package: "Package",
  board: "Board",
  product: "Product",
};
