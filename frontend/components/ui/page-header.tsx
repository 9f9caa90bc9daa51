import type { ReactNode } from "react";

export function PageHeader({
  title,
  description,
  actions,
  eyebrow,
}: {
  title: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
  eyebrow?: ReactNode;
}) {
  return (
    <div className="mb-5 flex flex-wrap items-end justify-between gap-4">
      <div className="min-w-0">
        {eyebrow ? <div className="mb-1 text-xs font-semibold text-ink/55">{eyebrow}</div> : null}
        <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{title}</h1>
        {description ? <p className="mt-1 max-w-3xl text-[13px] text-ink/65">{description}</p> : null}
      </div>
      {actions ? <div className="flex items-center gap-2">{actions}</div> : null}
    </div>
  );
}
