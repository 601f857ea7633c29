import { Link } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { paths } from "../../../config/paths";
import { ForgotPasswordForm } from "../../../features/auth/components/forgot-password-form";

export function Component() {
  return (
    <AuthLayout
      title="Reset your password"
      description="We e-mail you a link to choose a new password."
      footer={
        <Link to={paths.auth.signIn.getHref()} className="underline decoration-rule-strong underline-offset-2 hover:text-ink">
          Back to sign-in
        </Link>
      }
    >
      <ForgotPasswordForm />
    </AuthLayout>
  );
}
