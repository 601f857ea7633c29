import { useNavigate, useParams } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { paths } from "../../../config/paths";
import { AcceptInviteForm } from "../../../features/auth/components/accept-invite-form";
import type { SignInState } from "./sign-in";

export function Component() {
  const { token = "" } = useParams();
  const navigate = useNavigate();

  return (
    <AuthLayout title="Join your team on Stillpoint" description="Set your name and a password to accept the invitation.">
      <AcceptInviteForm
        token={token}
        onAccepted={({ session, email }) => {
          if (session) {
            void navigate(paths.app.overview.getHref(), { replace: true });
            return;
          }
          const state: SignInState = { notice: "Invitation accepted. Sign in with your new password.", email };
          void navigate(paths.auth.signIn.getHref(), { replace: true, state });
        }}
      />
    </AuthLayout>
  );
}
