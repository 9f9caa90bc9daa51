import { PageHeader } from "@frontend/components/ui/page-header";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { ChangePasswordForm, NameForm } from "@frontend/features/auth/components/password-forms";
import { NotificationMailSettings } from "@frontend/features/notifications";

/** The signed-in person's own account: their name, password and which notifications reach them by e-mail. Every role has it. */
export function AccountRoute() {
  const me = useMe();
  return (
    <>
      <PageHeader title="Your account" description={`Signed in as ${me.user.email} in ${me.workspace.name}.`} />
      <div className="grid max-w-4xl gap-5 lg:grid-cols-2">
        <Panel title="Name">
          <NameForm key={me.user.name} current={me.user.name} />
        </Panel>
        <Panel title="Password">
          <ChangePasswordForm />
        </Panel>
        <Panel title="Notifications by e-mail" className="lg:col-span-2">
          <NotificationMailSettings role={me.role} />
        </Panel>
      </div>
    </>
  );
}
