import { AlertIcon } from "@frontend/components/ui/icons";

/** The cautions of DESIGN.md, shown wherever results are. */
export function StudyCautions({ className }: { className?: string }) {
  return (
    <aside
      aria-label="Cautions"
      className={`flex gap-2.5 rounded-md border border-[#c2903f]/40 bg-[#fbf3e2] px-3 py-2 text-xs leading-[18px] text-ink/80 ${className ?? ""}`}
    >
      <AlertIcon className="mt-0.5 shrink-0 text-[#8a5a00]" />
      <p>
        <span className="font-bold text-ink">These are predictions</span> from a model of the tolerances entered; they do not replace
        qualification of built parts. Heading accuracy that matters for safety must be confirmed by test under the applicable standards, and
        a magnetic compass must not be the only means of navigation where a wrong heading can hurt someone.
      </p>
    </aside>
  );
}

/** What a calibration does and does not correct, in words, beside the results. */
export function CalibrationNote({ after }: { after: "none" | "package" | "board" }) {
  return (
    <p data-testid="calibration-note" className="rounded-md border border-line bg-panel px-3 py-2 text-xs leading-[18px] text-ink/75">
      {after === "none" ? (
        <>
          <span className="font-bold text-ink">No calibration in this study:</span> every figure is the part as built.
        </>
      ) : (
        <>
          <span className="font-bold text-ink">Calibrated after the {after} stage:</span> the calibration corrects the cross-axis terms of
          each sensor and with them the compass heading, down to its residual. It does not straighten anything: the geometric tilt of each
          die and the relative rotation between dies stay as built.
        </>
      )}
    </p>
  );
}
