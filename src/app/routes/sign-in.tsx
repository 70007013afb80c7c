import { useNavigate, useSearchParams } from 'react-router-dom';
import { AuthFrame } from '../../features/auth/components/auth-frame';
import { SignInForm } from '../../features/auth/components/sign-in-form';

export function Component() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const redirectTo = params.get('redirectTo');
  // Only same-site paths, never an absolute URL from the query string.
  const target = redirectTo && redirectTo.startsWith('/') && !redirectTo.startsWith('//') ? redirectTo : '/';
  return (
    <AuthFrame title="Sign in">
      <SignInForm onSignedIn={() => navigate(target, { replace: true })} />
    </AuthFrame>
  );
}
