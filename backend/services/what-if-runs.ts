/**
 * Reading what a what-if run stores: one `input` and one `result` column hold a sweep's or an
 * allocation's, and the row's `kind` says which. These narrow the stored union by its own
 * fields (a sweep names its parameter; an allocation's outcome says whether it was verified), so
 * a row whose JSON does not fit its kind fails loudly instead of being read as the other.
 */
import type { AllocationOutcome } from "@shared/whatif/allocation";
import type { StoredAllocationInput, StoredSweepInput, SweepOutcome, WhatIfInput, WhatIfResult } from "@shared/schemas/what-if";

export function sweepInputOf(input: WhatIfInput): StoredSweepInput {
  if (!("parameter" in input)) throw new Error("the stored input of this sweep names no parameter");
  return input;
}

export function allocationInputOf(input: WhatIfInput): StoredAllocationInput {
  if ("parameter" in input) throw new Error("the stored input of this allocation is a sweep's");
  return input;
}

/** A sweep's points so far; null before its first point. */
export function sweepResultOf(result: WhatIfResult | null): SweepOutcome | null {
  if (result === null) return null;
  if (!("points" in result)) throw new Error("the stored result of this sweep has no points");
  return result;
}

/** An allocation's outcome; null until it has finished. */
export function allocationResultOf(result: WhatIfResult | null): AllocationOutcome | null {
  if (result === null) return null;
  if (!("verified" in result)) throw new Error("the stored result of this allocation is a sweep's");
  return result;
}
