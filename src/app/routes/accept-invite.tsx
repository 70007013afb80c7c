import { useSearchParams } from 'react-router-dom';
import { AuthFrame } from '../../features/auth/components/auth-frame';
import { PasswordLinkForm } from '../../features/auth/components/password-link-form';

export function Component() {
  const [params] = useSearchParams();
  return (
    <AuthFrame title="Accept your invitation">
      <p className="text-steel-700">Choose a password for your Kerfbook account.</p>
      <PasswordLinkForm token={params.get('token') ?? ''} submitLabel="Set password and join" />
    </AuthFrame>
  );
}
