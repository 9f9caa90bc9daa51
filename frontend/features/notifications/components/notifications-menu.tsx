import { useState } from "react";
import { useNavigate } from "react-router";
import { Button } from "@frontend/components/ui/button";
import { cn } from "@frontend/lib/cn";
import { formatDateTime } from "@frontend/lib/format";
import { useMarkRead, useNotifications } from "../api/notifications";

/** The top bar's count of what waits for this person, opening the list; a click goes there and marks it read. */
export function NotificationsMenu() {
  const { data } = useNotifications();
  const markRead = useMarkRead();
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const unread = data?.unread ?? 0;
  return (
    <div className="relative">
      <Button
        size="sm"
        variant="ghost"
        onClick={() => setOpen((o) => !o)}
        aria-expanded={open}
        aria-label={`Notifications, ${unread} unread`}
      >
        Notifications
        {unread ? (
          <span className="ml-1 rounded-full bg-mag px-1.5 text-[11px] font-extrabold text-white tabular-nums" data-testid="unread-count">
            {unread}
          </span>
        ) : null}
      </Button>
      {open ? (
        <div
          role="dialog"
          aria-label="Notifications"
          className="absolute right-0 z-30 mt-2 w-96 overflow-hidden rounded-lg border border-line bg-panel shadow-lg"
        >
          <div className="flex items-center justify-between border-b border-line px-3 py-2">
            <p className="text-xs font-bold text-ink">What waits for you</p>
            {unread ? (
              <button type="button" className="text-xs font-semibold text-ink/60 hover:text-ink" onClick={() => markRead.mutate(undefined)}>
                Mark all read
              </button>
            ) : null}
          </div>
          {data?.notifications.length ? (
            <ul className="max-h-96 divide-y divide-line/70 overflow-y-auto">
              {data.notifications.map((n) => (
                <li key={n.id}>
                  <button
                    type="button"
                    className={cn(
                      "block w-full px-3 py-2 text-left text-[13px] hover:bg-paper",
                      n.readAt ? "text-ink/60" : "font-semibold text-ink",
                    )}
                    onClick={() => {
                      setOpen(false);
                      if (!n.readAt) markRead.mutate([n.id]);
                      void navigate(n.link);
                    }}
                  >
                    {n.title}
                    <span className="block text-[11px] font-normal text-ink/50 tabular-nums">{formatDateTime(n.createdAt)}</span>
                  </button>
                </li>
              ))}
            </ul>
          ) : (
            <p className="px-3 py-4 text-[13px] text-ink/55">Nothing waits for you.</p>
          )}
        </div>
      ) : null}
    </div>
  );
}
