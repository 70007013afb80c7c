import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { loginSchema, type LoginInput } from '../../../../shared/schemas/auth';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useLogin } from '../api/login';
import { paths } from '../../../config/paths';

export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const login = useLogin();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<LoginInput>({ resolver: zodResolver(loginSchema) });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await login.mutateAsync(values);
      onSignedIn();
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['email', 'password']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormMessages error={formError} />
      <TextField label="E-mail" type="email" autoComplete="username" inputMode="email" error={formState.errors.email?.message} {...register('email')} />
      <TextField label="Password" type="password" autoComplete="current-password" error={formState.errors.password?.message} {...register('password')} />
      <Button type="submit" className="w-full" busy={formState.isSubmitting}>
        Sign in
      </Button>
      <p className="text-center text-sm">
        <Link className="font-semibold text-mandatory underline" to={paths.forgotPassword.getHref()}>
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}
