/** A metric id of MODEL.md section 7 in words, for report tables and charts. */
const AXIS = ["x", "y", "z"];

export function describeMetric(id: string): string {
  if (id === "heading.maxAbsDeg") return "Heading error, largest over the attitude sweep";
  if (id === "heading.rmsDeg") return "Heading error, RMS over the attitude sweep";
  let m = /^(.+)~(.+)\.relRotDeg$/.exec(id);
  if (m) return `Relative rotation, ${m[1]} to ${m[2]}`;
  m = /^(.+)\.tiltDeg$/.exec(id);
  if (m) return `Tilt of ${m[1]}`;
  m = /^(.+)\.crossAxisPct\.([xyz])([xyz])$/.exec(id);
  if (m) return `${m[1]} cross-axis sensitivity of ${m[2]} to ${m[3]}`;
  m = /^(.+)\.crossAxisTotalPct\.([xyz])$/.exec(id);
  if (m) return `${m[1]} total cross-axis sensitivity, ${m[2]} axis`;
  m = /^(.+)\.axisMisalignDeg\.([xyz])$/.exec(id);
  if (m && AXIS.includes(m[2])) return `${m[1]} axis misalignment, ${m[2]} axis`;
  return id;
}

export function metricUnit(id: string): "%" | "°" {
  return /Pct\./.test(id) ? "%" : "°";
}
