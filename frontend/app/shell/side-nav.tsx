import type { ReactNode } from "react";
import { NavLink } from "react-router";
import type { Role } from "@shared/schemas/common";
import { Logo } from "@frontend/components/ui/logo";
import { MembersIcon, OutboxIcon, ProjectsIcon, ReportsIcon, StatusIcon, SuppliersIcon, TrayIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { can } from "@frontend/lib/permissions";

type NavItem = { to: string; label: string; icon: ReactNode; note?: string; end?: boolean; countWords?: string };

/** Counts shown beside a screen's name, by its path: `{"/": 3}` is three things waiting on the home page. */
export type NavCounts = Partial<Record<string, number>>;

/** What each role sees in the navigation: read off the rights table (shared/permissions.ts). */
export function navItemsFor(role: Role): NavItem[] {
  const items: NavItem[] = [];
  if (can(role, "reviews.read")) items.push({ to: "/", label: "Home", icon: <TrayIcon />, end: true, countWords: "waiting for you" });
  if (can(role, "projects.read")) items.push({ to: "/projects", label: "Projects", icon: <ProjectsIcon /> });
  if (can(role, "reports.read")) items.push({ to: "/reports", label: "Reports", icon: <ReportsIcon /> });
  if (can(role, "suppliers.read")) {
    items.push({
      to: "/suppliers",
      label: "Suppliers",
      icon: <SuppliersIcon />,
      note: can(role, "suppliers.write") ? undefined : "read only",
    });
  }
  if (can(role, "members.manage")) items.push({ to: "/members", label: "Members", icon: <MembersIcon /> });
  if (can(role, "outbox.read")) items.push({ to: "/outbox", label: "Outbox", icon: <OutboxIcon /> });
  if (can(role, "status.read")) items.push({ to: "/status", label: "Server status", icon: <StatusIcon /> });
  return items;
}

export function SideNav({ role, counts = {} }: { role: Role; counts?: NavCounts }) {
  const items = navItemsFor(role);
  return (
    // Below the md breakpoint the rail keeps only the icons, so tables keep their width.
    <aside className="flex w-14 shrink-0 flex-col bg-ink text-paper md:w-56">
      <div className="flex h-14 items-center border-b border-white/[0.08] px-3 md:px-4">
        <Logo className="[&>span:last-child]:max-md:sr-only" />
      </div>
      <nav aria-label="Main" className="flex-1 px-2 pt-4">
        <ul className="space-y-0.5">
          {items.map((item) => (
            <li key={item.to}>
              <NavLink
                to={item.to}
                end={item.end}
                className={({ isActive }) =>
                  cn(
                    "group relative flex h-8.5 items-center gap-2.5 rounded-md px-2.5 text-[13px] font-semibold transition-colors",
                    isActive ? "bg-white/[0.09] text-white" : "text-paper/65 hover:bg-white/[0.05] hover:text-paper",
                  )
                }
              >
                {({ isActive }) => (
                  <>
                    {isActive ? <span className="absolute top-1.5 bottom-1.5 -left-2 w-[3px] rounded-r bg-mag" aria-hidden="true" /> : null}
                    <span className={cn(isActive ? "text-mag" : "text-paper/50 group-hover:text-paper/75")}>{item.icon}</span>
                    <span className="flex-1 max-md:sr-only">{item.label}</span>
                    {item.note ? <span className="text-[10px] font-medium text-paper/35 max-md:hidden">{item.note}</span> : null}
                    {counts[item.to] ? (
                      <span
                        className="rounded-full bg-mag px-1.5 text-[11px] leading-4.5 font-extrabold text-white tabular-nums max-md:absolute max-md:top-0.5 max-md:right-0.5 max-md:px-1 max-md:text-[9px] max-md:leading-3.5"
                        title={`${counts[item.to]} ${item.countWords ?? ""}`.trim()}
                        data-testid={`nav-count-${item.label.toLowerCase()}`}
                      >
                        {counts[item.to]}
                        {item.countWords ? <span className="sr-only"> {item.countWords}</span> : null}
                      </span>
                    ) : null}
                  </>
                )}
              </NavLink>
            </li>
          ))}
        </ul>
      </nav>
      <div className="border-t border-white/[0.08] px-4 py-3 text-[11px] leading-4 text-paper/40 max-md:hidden">
        Predictions from the tolerances entered. They do not replace qualification of built parts.
      </div>
    </aside>
  );
}
