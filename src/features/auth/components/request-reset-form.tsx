import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { requestResetSchema } from '../../../../shared/schemas/auth';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { useRequestReset } from '../api/password-links';
import { paths } from '../../../config/paths';

export function RequestResetForm() {
  const reset = useRequestReset();
  const { register, handleSubmit, formState } = useForm<{ email: string }>({ resolver: zodResolver(requestResetSchema) });
  if (reset.isSuccess)
    return (
      <Notice tone="safe" title="Check your e-mail">
        {reset.data.message}
      </Notice>
    );
  return (
    <form onSubmit={handleSubmit((v) => reset.mutateAsync(v))} noValidate className="space-y-4">
      {reset.isError ? (
        <Notice tone="danger" role="alert">
          {reset.error.message}
        </Notice>
      ) : null}
      <TextField label="Your e-mail" type="email" autoComplete="username" error={formState.errors.email?.message} {...register('email')} />
      <Button type="submit" className="w-full" busy={formState.isSubmitting}>
        Send me a reset link
      </Button>
      <p className="text-center text-sm">
        <Link className="font-semibold text-mandatory underline" to={paths.signIn.getHref()}>
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}
