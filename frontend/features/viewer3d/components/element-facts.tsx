/** What the tooltip says about the element (or the bond line under it) under the pointer. */
import type { StackFile } from "@shared/schemas/stack-file";
import { BOND_LINE, KIND_COLOUR, KIND_LABEL } from "../lib/palette";
import type { PoseSet } from "../lib/poses";
import { fmt } from "../lib/viewer-format";
import { formatValue } from "@shared/format";

export function ElementFacts({ stack, set, index, part }: { stack: StackFile; set: PoseSet; index: number; part: "body" | "bond" }) {
  const e = stack.elements[index];
  if (!e) return null;
  const tilt = set.tiltDeg[index];
  return (
    <>
      <div className="flex items-center gap-2">
        <span
          className="size-2.5 rounded-sm"
          style={{ background: part === "bond" ? BOND_LINE : KIND_COLOUR[e.kind] }}
          aria-hidden="true"
        />
        <span className="font-bold">{part === "bond" ? `Bond line under ${e.name ?? e.id}` : (e.name ?? e.id)}</span>
        <span className="text-paper/60">{part === "bond" ? "adhesive" : KIND_LABEL[e.kind]}</span>
      </div>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-paper/85">
        {part === "bond" ? (
          <>
            <dt className="text-paper/55">thickness</dt>
            <dd className="num text-left">{fmt(e.bondLine?.thicknessUm ?? 0, 0)} µm</dd>
          </>
        ) : (
          <>
            {e.name ? (
              <>
                <dt className="text-paper/55">id</dt>
                <dd className="font-mono">{e.id}</dd>
              </>
            ) : null}
            <dt className="text-paper/55">size</dt>
            <dd className="num text-left">
              {fmt(e.size.x)} × {fmt(e.size.y)} × {fmt(e.size.z)} mm
            </dd>
            {e.bondLine?.thicknessUm ? (
              <>
                <dt className="text-paper/55">bond line</dt>
                <dd className="num text-left">{fmt(e.bondLine.thicknessUm, 0)} µm</dd>
              </>
            ) : null}
            <dt className="text-paper/55">centre</dt>
            <dd className="num text-left">
              x {fmt(set.P[3 * index], 3)}, y {fmt(set.P[3 * index + 1], 3)} mm
            </dd>
            {e.parent !== null ? (
              <>
                <dt className="text-paper/55">tilt</dt>
                <dd className="num text-left">{formatValue(tilt, "deg")}</dd>
              </>
            ) : null}
          </>
        )}
      </dl>
    </>
  );
}
