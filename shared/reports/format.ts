/** Names in the report files and screens: report numbers and tolerance distributions. Numbers are shared/format.ts's. */
import { formatPlain } from "../format";

export const reportCode = (number: number) => `TR-${String(number).padStart(4, "0")}`;

/** "TR-0003 rev 2" */
export const reportNumber = (r: { number: number; revision: number }) => `${reportCode(r.number)} rev ${r.revision}`;

export function distLabel(dist: string, sigmas: number | null): string {
  if (dist === "normal") return sigmas && sigmas !== 3 ? `normal, ±${formatPlain(sigmas)}σ` : "normal, ±3σ";
  if (dist === "data") return "measured data";
  return dist;
}
