import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import type { StudyDetail } from "../api/get-study";
import { settingRows } from "../lib/compare";
import { ABLabel } from "./compare-parts";

/** The two studies' settings side by side, rows that differ marked. */
export function SettingsTable({ a, b }: { a: StudyDetail; b: StudyDetail }) {
  const rows = settingRows(
    { study: a.study, site: a.site, revisionNumber: a.revisionNumber, trialsUsed: a.result?.trials },
    { study: b.study, site: b.site, revisionNumber: b.revisionNumber, trialsUsed: b.result?.trials },
  );
  return (
    <div className="overflow-x-auto rounded-md border border-line/80">
      <Table aria-label="Settings compared">
        <THead>
          <tr>
            <Th className="w-40">Setting</Th>
            <Th>
              <ABLabel side="a" /> Study {a.number}
            </Th>
            <Th>
              <ABLabel side="b" /> Study {b.number}
            </Th>
          </tr>
        </THead>
        <tbody>
          {rows.map((r) => (
            <Tr key={r.label} className={r.differs ? "bg-[#fbf3e2] hover:bg-[#f8ecd2]" : undefined}>
              <Td className="h-8 text-xs font-semibold text-ink/70">
                {r.label}
                {r.differs ? <span className="ml-2 text-2xs font-bold text-[#8a5a00]">differs</span> : null}
              </Td>
              <Td className="h-8 text-xs tabular-nums">{r.a}</Td>
              <Td className="h-8 text-xs tabular-nums">{r.b}</Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}
