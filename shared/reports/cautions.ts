/** The cautions of DESIGN.md that every report carries, word for word. */
export const REPORT_CAUTIONS = [
  "Results are predictions from a model of the tolerances entered; they do not replace qualification of built parts.",
  "Heading accuracy that matters for safety must be confirmed by test under the applicable standards, and a magnetic compass must not be the sole means of navigation where a wrong heading can hurt someone.",
] as const;
