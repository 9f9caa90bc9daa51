import { Link, useNavigate } from "react-router";
import { useQueryClient } from "@tanstack/react-query";
import type { Me } from "@shared/schemas/api";
import { Button } from "@frontend/components/ui/button";
import { SignOutIcon } from "@frontend/components/ui/icons";
import { RoleBadge } from "@frontend/components/ui/role-badge";
import { useSignOut } from "@frontend/features/auth/api/sign-out";
import { NotificationsMenu } from "@frontend/features/notifications";
import { initials } from "@frontend/lib/format";

export function TopBar({ me }: { me: Me }) {
  const signOut = useSignOut();
  const navigate = useNavigate();
  const queryClient = useQueryClient();

  function handleSignOut() {
    signOut.mutate(undefined, {
      onSuccess: async () => {
        await navigate("/sign-in", { replace: true });
        // Only once the shell is gone, so nothing on screen asks for data it may no longer see.
        queryClient.clear();
      },
    });
  }

  return (
    <header className="flex h-14 shrink-0 items-center justify-between gap-4 border-b border-line bg-panel px-6">
      <div className="flex min-w-0 items-center gap-2.5">
        <span className="flex size-7 shrink-0 items-center justify-center rounded-md border border-line bg-paper text-[10px] font-extrabold text-board">
          {initials(me.workspace.name)}
        </span>
        <div className="min-w-0 leading-tight">
          <p className="text-[10px] font-bold tracking-[0.1em] text-ink/45 uppercase">Workspace</p>
          <p className="truncate text-[13px] font-bold text-ink" data-testid="workspace-name">
            {me.workspace.name}
          </p>
        </div>
      </div>
      <div className="flex items-center gap-3">
        {signOut.isError ? <span className="text-xs text-fail">{signOut.error.message}</span> : null}
        <NotificationsMenu />
        <Link
          to="/account"
          className="flex items-center gap-2.5 rounded-md hover:bg-ink/[0.04]"
          aria-label="Signed in as (your account)"
          title="Your account"
        >
          <span className="flex size-7.5 items-center justify-center rounded-full bg-ink text-[10px] font-extrabold text-paper">
            {initials(me.user.name)}
          </span>
          <div className="hidden leading-tight sm:block">
            <p className="text-[13px] font-bold text-ink" data-testid="current-user">
              {me.user.name}
            </p>
            <p className="text-[11px] text-ink/55">{me.user.email}</p>
          </div>
          <RoleBadge role={me.role} />
        </Link>
        <span className="h-6 w-px bg-line" aria-hidden="true" />
        <Button size="sm" variant="ghost" icon={<SignOutIcon />} onClick={handleSignOut} pending={signOut.isPending}>
          Sign out
        </Button>
      </div>
    </header>
  );
}
