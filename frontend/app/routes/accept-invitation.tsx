import type { QueryClient } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import { RoleBadge } from "@frontend/components/ui/role-badge";
import { invitationPreviewQueryOptions, useInvitationPreview } from "@frontend/features/invitations/api/get-invitation-preview";
import { AcceptInvitationForm } from "@frontend/features/invitations/components/accept-invitation-form";
import { isApiError } from "@frontend/lib/api-client";
import { AuthFrame } from "../shell/auth-frame";

export const acceptInvitationLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const token = params.token ?? "";
    try {
      await queryClient.ensureQueryData(invitationPreviewQueryOptions(token));
    } catch (error) {
      if (isApiError(error) && (error.status === 404 || error.status === 400 || error.status === 410)) {
        throw data({ message: "This invitation link is not valid any more." }, { status: 404 });
      }
      throw error;
    }
    return null;
  };

export function AcceptInvitationRoute() {
  const { token = "" } = useParams();
  const { data: invitation } = useInvitationPreview(token);
  const navigate = useNavigate();

  return (
    <AuthFrame>
      <p className="text-xs font-semibold text-ink/55">Invitation</p>
      <h1 className="mt-0.5 text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">Join {invitation.workspaceName}</h1>
      <p className="mt-1.5 mb-6 text-[13px] leading-6 text-ink/60">
        You are invited as <RoleBadge role={invitation.role} className="mx-0.5 align-middle" />. Set your name and a password to finish.
      </p>
      <AcceptInvitationForm token={token} invitation={invitation} onAccepted={() => navigate("/", { replace: true })} />
    </AuthFrame>
  );
}

/** Shown instead of the form when the token is unknown, used, revoked or expired. */
export function InvitationInvalid() {
  return (
    <AuthFrame>
      <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">This invitation cannot be used</h1>
      <p className="mt-2 text-[13px] text-ink/65">
        The link may have been used already, revoked, or it has expired. Ask your workspace admin to send a new invitation.
      </p>
      <p className="mt-6">
        <Link to="/sign-in" className="text-[13px] font-bold text-gyro hover:underline">
          Go to sign in
        </Link>
      </p>
    </AuthFrame>
  );
}
