import { Link, useNavigate, useParams } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { paths } from "../../../config/paths";
import { ResetPasswordForm } from "../../../features/auth/components/reset-password-form";
import type { SignInState } from "./sign-in";

export function Component() {
  const { token = "" } = useParams();
  const navigate = useNavigate();
  const done: SignInState = { notice: "Password saved. Sign in with the new one." };

  return (
    <AuthLayout
      title="Choose a new password"
      footer={
        <Link to={paths.auth.signIn.getHref()} className="underline decoration-rule-strong underline-offset-2 hover:text-ink">
          Back to sign-in
        </Link>
      }
    >
      <ResetPasswordForm token={token} onSuccess={() => void navigate(paths.auth.signIn.getHref(), { state: done })} />
    </AuthLayout>
  );
}
