import { useSearchParams } from 'react-router-dom';
import { AuthFrame } from '../../features/auth/components/auth-frame';
import { PasswordLinkForm } from '../../features/auth/components/password-link-form';

export function Component() {
  const [params] = useSearchParams();
  return (
    <AuthFrame title="Choose a new password">
      <PasswordLinkForm token={params.get('token') ?? ''} submitLabel="Save the new password" />
    </AuthFrame>
  );
}
