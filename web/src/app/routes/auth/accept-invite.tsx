import { useNavigate, useParams } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { paths } from "../../../config/paths";
import { AcceptInviteForm } from "../../../features/auth/components/accept-invite-form";

export function Component() {
  const { token = "" } = useParams();
  const navigate = useNavigate();

  return (
    <AuthLayout title="Join your team on Stillpoint" description="Set your name and a password to accept the invitation.">
      <AcceptInviteForm token={token} onAccepted={() => void navigate(paths.app.overview.getHref(), { replace: true })} />
    </AuthLayout>
  );
}
