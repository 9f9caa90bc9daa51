/** The folding legend in the 3D view's corner: element kinds present, bond line, sensing-axis colours. */
import type { ElementKind } from "@shared/schemas/stack-file";
import { AXIS_COLOUR, BOND_LINE, KIND_COLOUR, KIND_LABEL } from "../lib/palette";

export function ViewerLegend({
  kinds,
  showSensingAxes,
  open,
  onToggle,
}: {
  kinds: ElementKind[];
  showSensingAxes: boolean;
  open: boolean;
  onToggle: () => void;
}) {
  return (
    <div className="absolute bottom-2.5 left-2.5 rounded-md bg-[#0f161d]/75 px-2.5 py-2 text-2xs text-paper/85" data-testid="viewer-legend">
      <button
        type="button"
        className="flex w-full items-center justify-between gap-3 font-semibold text-paper/70 hover:text-paper"
        aria-expanded={open}
        onClick={onToggle}
      >
        Legend
        <span aria-hidden="true">{open ? "–" : "+"}</span>
      </button>
      {open ? (
        <>
          <ul className="mt-1 grid grid-cols-[repeat(2,auto)] gap-x-3 gap-y-0.5">
            {kinds.map((k) => (
              <li key={k} className="flex items-center gap-1.5">
                <span className="size-2.5 rounded-sm" style={{ background: KIND_COLOUR[k] }} aria-hidden="true" />
                {KIND_LABEL[k]}
              </li>
            ))}
            <li className="flex items-center gap-1.5">
              <span className="h-1 w-2.5 rounded-sm opacity-60" style={{ background: BOND_LINE }} aria-hidden="true" />
              Bond line
            </li>
          </ul>
          {showSensingAxes ? (
            <div className="mt-1.5 flex items-center gap-2 border-t border-paper/15 pt-1.5">
              <span className="text-paper/60">Sensing axes</span>
              {(["x", "y", "z"] as const).map((n, a) => (
                <span key={n} className="flex items-center gap-1">
                  <span className="h-0.5 w-3 rounded" style={{ background: AXIS_COLOUR[a] }} aria-hidden="true" />
                  <span style={{ color: AXIS_COLOUR[a] }}>{n}</span>
                </span>
              ))}
            </div>
          ) : null}
          {showSensingAxes ? <div className="text-paper/50">Label ring: the die&apos;s colour</div> : null}
          <div className="mt-1 text-paper/50">Grid 1 mm, bold every 5 mm</div>
        </>
      ) : null}
    </div>
  );
}
