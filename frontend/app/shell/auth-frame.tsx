import type { ReactNode } from "react";
import { Logo } from "@frontend/components/ui/logo";

/**
 * Section through a 9-axis package as drawn on a packaging drawing: board, solder,
 * substrate, ASIC, the gyroscope and accelerometer dies and the magnetometer on top,
 * with bond lines, sensing-axis triads and one tolerance call-out.
 */
function StackSection() {
  const bond = "rgba(247,245,240,0.28)";
  return (
    <svg viewBox="0 0 420 250" className="w-full max-w-[440px]" role="img" aria-label="Section through a stacked sensor package">
      <defs>
        <pattern id="hatch" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <line x1="0" y1="0" x2="0" y2="6" stroke="rgba(247,245,240,0.12)" strokeWidth="2" />
        </pattern>
        <marker id="arrow" viewBox="0 0 6 6" refX="5" refY="3" markerWidth="5" markerHeight="5" orient="auto-start-reverse">
          <path d="M0 0 6 3 0 6z" fill="currentColor" />
        </marker>
      </defs>
      {/* board */}
      <rect x="10" y="200" width="400" height="26" fill="#2f4f3f" />
      <rect x="10" y="200" width="400" height="26" fill="url(#hatch)" />
      {/* solder joints */}
      {[78, 118, 158, 198, 238, 278, 318].map((x) => (
        <ellipse key={x} cx={x + 12} cy="194" rx="11" ry="6" fill="#a3a89c" />
      ))}
      {/* substrate */}
      <rect x="66" y="176" width="288" height="12" fill="#7c8b4f" />
      {/* ASIC with its bond line */}
      <rect x="96" y="172" width="228" height="4" fill={bond} />
      <rect x="96" y="140" width="228" height="32" rx="1.5" fill="#64748b" />
      {/* gyro + accel dies */}
      <rect x="112" y="136" width="96" height="4" fill={bond} />
      <rect x="112" y="106" width="96" height="30" rx="1.5" fill="#4f46e5" />
      <rect x="212" y="136" width="96" height="4" fill={bond} />
      <rect x="212" y="106" width="96" height="30" rx="1.5" fill="#0d9488" transform="rotate(-1.6 260 121)" />
      {/* magnetometer */}
      <rect x="160" y="102" width="100" height="4" fill={bond} />
      <rect x="160" y="76" width="100" height="26" rx="1.5" fill="#e4572e" />

      {/* axis triads */}
      <g color="rgba(247,245,240,0.85)" stroke="currentColor" strokeWidth="1.4" fill="none">
        <path d="M136 121h22" markerEnd="url(#arrow)" />
        <path d="M136 121v-22" markerEnd="url(#arrow)" />
        <g transform="rotate(-1.6 260 121)">
          <path d="M242 121h22" markerEnd="url(#arrow)" />
          <path d="M242 121v-22" markerEnd="url(#arrow)" />
        </g>
        <path d="M190 89h22" markerEnd="url(#arrow)" />
        <path d="M190 89v-24" markerEnd="url(#arrow)" />
      </g>

      {/* tolerance call-out on the tilted die */}
      <g stroke="rgba(247,245,240,0.55)" strokeWidth="1" fill="none">
        <path d="M308 106h60M308 103.2l60-1.7" strokeDasharray="3 3" />
        <path d="M362 92a20 20 0 0 1 0 16" markerEnd="url(#arrow)" color="rgba(247,245,240,0.55)" />
      </g>
      <text
        x="372"
        y="88"
        fill="rgba(247,245,240,0.8)"
        fontSize="11"
        fontWeight="700"
        fontFamily="Manrope, sans-serif"
        style={{ fontVariantNumeric: "tabular-nums" }}
      >
        θ ≤ 0.30°
      </text>
      <g stroke="rgba(247,245,240,0.55)" strokeWidth="1">
        <path d="M40 172v8M40 136v8" />
        <path d="M36 172h8M36 136h8" />
        <path d="M40 146v24" markerStart="url(#arrow)" markerEnd="url(#arrow)" color="rgba(247,245,240,0.55)" />
      </g>
      <text
        x="10"
        y="128"
        fill="rgba(247,245,240,0.8)"
        fontSize="11"
        fontWeight="700"
        fontFamily="Manrope, sans-serif"
        style={{ fontVariantNumeric: "tabular-nums" }}
      >
        180 ± 10 µm
      </text>
      <path d="M44 140h52" stroke="rgba(247,245,240,0.25)" strokeDasharray="2 3" />
    </svg>
  );
}

export function AuthFrame({ children }: { children: ReactNode }) {
  return (
    <div className="grid min-h-dvh lg:grid-cols-[minmax(0,1.05fr)_minmax(0,1fr)]">
      <aside className="relative hidden flex-col justify-between overflow-hidden bg-ink px-12 py-10 text-paper lg:flex">
        <div
          className="pointer-events-none absolute inset-0 opacity-[0.35]"
          style={{
            backgroundImage:
              "linear-gradient(rgba(247,245,240,0.05) 1px, transparent 1px), linear-gradient(90deg, rgba(247,245,240,0.05) 1px, transparent 1px)",
            backgroundSize: "24px 24px",
          }}
          aria-hidden="true"
        />
        <Logo className="relative" />
        <div className="relative">
          <StackSection />
          <h2 className="mt-10 max-w-md text-[26px] leading-8 font-extrabold tracking-[-0.02em]">
            Tolerance studies for stacked inertial-sensor packages.
          </h2>
          <p className="mt-3 max-w-md text-[14px] leading-6 text-paper/60">
            One reviewed model of every bond line, tilt and placement, from die to board: predicted yield against the system budget, and a
            written tolerance report for each supplier.
          </p>
        </div>
        <p className="relative text-[11px] text-paper/35">
          Results are predictions from the tolerances entered. They do not replace qualification of built parts.
        </p>
      </aside>
      <main className="flex flex-col items-center justify-center px-6 py-12">
        <div className="mb-8 lg:hidden">
          <Logo tone="dark" />
        </div>
        <div className="w-full max-w-[380px]">{children}</div>
      </main>
    </div>
  );
}
