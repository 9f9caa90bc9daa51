import type { BadgeTone } from "@frontend/components/ui/badge";

export const SUPPLIER_KINDS = ["assembly", "substrate", "die", "board", "other"] as const;
export type SupplierKind = (typeof SUPPLIER_KINDS)[number];

export const KIND_LABELS: Record<string, string> = {
  assembly: "Assembly house",
  substrate: "Substrate maker",
  die: "Die supplier",
  board: "Board assembler",
  other: "Other",
};

export const KIND_TONES: Record<string, BadgeTone> = {
  assembly: "asic",
  substrate: "substrate",
  die: "gyro",
  board: "board",
  other: "neutral",
};
