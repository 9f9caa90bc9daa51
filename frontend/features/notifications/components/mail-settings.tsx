import type { Role } from "@shared/schemas/common";
import type { NotificationKind } from "@shared/schemas/notifications";
import { Alert } from "@frontend/components/ui/alert";
import { Spinner } from "@frontend/components/ui/spinner";
import { can, type Right } from "@frontend/lib/permissions";
import { useNotificationSettings, useSetNotificationMail } from "../api/settings";

/**
 * Who is told of each kind (backend/services/review-notifications.ts): the reviewers of what
 * waits for them, the author of what happened to their revision or report. A kind is offered to
 * a role holding the right that makes it its receiver, so nobody sets mail they never get.
 */
const RECEIVER_RIGHT: Record<NotificationKind, Right> = {
  "revision.submitted": "revisions.review",
  "report.ready": "reports.release",
  "revision.returned": "revisions.write",
  "revision.approved": "revisions.write",
  "report.returned": "reports.write",
  "report.released": "reports.write",
  "report.sent": "reports.write",
  "report.question": "reports.write",
  "report.acknowledged": "reports.write",
  "report.measurements": "reports.write",
};

export function kindsFor(role: Role): NotificationKind[] {
  return (Object.keys(RECEIVER_RIGHT) as NotificationKind[]).filter((k) => can(role, RECEIVER_RIGHT[k]));
}

/** One switch per kind: mail me, or only show it in the app. Each change is stored at once. */
export function NotificationMailSettings({ role }: { role: Role }) {
  const settings = useNotificationSettings();
  const setMail = useSetNotificationMail();
  const offered = new Set(kindsFor(role));
  if (settings.isPending) return <Spinner />;
  if (settings.isError) return <Alert title="Your notification settings could not be loaded">{settings.error.message}</Alert>;
  const kinds = settings.data.kinds.filter((k) => offered.has(k.kind));
  if (!kinds.length) return <p className="text-[13px] text-ink/60">Nothing is mailed to your role besides the reports themselves.</p>;
  return (
    <fieldset className="space-y-3">
      <legend className="text-[13px] text-ink/70">
        Everything shows under Notifications in the app. Untick a kind to stop its e-mail.
      </legend>
      {setMail.isError ? <Alert>{setMail.error.message}</Alert> : null}
      <ul className="divide-y divide-line/70 rounded-md border border-line">
        {kinds.map((k) => {
          const changing = setMail.isPending && setMail.variables?.kind === k.kind;
          return (
            <li key={k.kind}>
              <label className="flex cursor-pointer items-center gap-2.5 px-3 py-2 text-[13px]">
                <input
                  type="checkbox"
                  checked={changing ? setMail.variables.email : k.email}
                  disabled={setMail.isPending}
                  onChange={(e) => setMail.mutate({ kind: k.kind, email: e.target.checked })}
                  className="accent-[var(--color-mag)]"
                />
                <span className="flex-1 font-semibold text-ink">{k.label}</span>
                {changing ? <Spinner size={12} className="text-ink/40" /> : null}
              </label>
            </li>
          );
        })}
      </ul>
    </fieldset>
  );
}
