import { AuthFrame } from '../../features/auth/components/auth-frame';
import { RequestResetForm } from '../../features/auth/components/request-reset-form';

export function Component() {
  return (
    <AuthFrame title="Reset your password">
      <RequestResetForm />
    </AuthFrame>
  );
}
