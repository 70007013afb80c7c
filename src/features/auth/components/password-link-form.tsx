import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { tokenPasswordSchema, type TokenPasswordInput } from '../../../../shared/schemas/auth';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRedeemLink } from '../api/password-links';
import { paths } from '../../../config/paths';

/** Sets a password from an invitation or reset link (the token comes from the link). */
export function PasswordLinkForm({ token, submitLabel }: { token: string; submitLabel: string }) {
  const redeem = useRedeemLink();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<TokenPasswordInput>({ resolver: zodResolver(tokenPasswordSchema), defaultValues: { token } });

  if (redeem.isSuccess) {
    return (
      <Notice tone="safe" title="Password set">
        You can now sign in as {redeem.data.email}.{' '}
        <Link className="font-semibold underline" to={paths.signIn.getHref()}>
          Go to sign-in
        </Link>
      </Notice>
    );
  }
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await redeem.mutateAsync(values);
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['password', 'confirm']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormMessages error={formError} />
      {!token ? <Notice tone="danger">This link is incomplete. Open the link from your e-mail again.</Notice> : null}
      <input type="hidden" {...register('token')} />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters; a short sentence works well."
        error={formState.errors.password?.message}
        {...register('password')}
      />
      <TextField label="Repeat the password" type="password" autoComplete="new-password" error={formState.errors.confirm?.message} {...register('confirm')} />
      <Button type="submit" className="w-full" busy={formState.isSubmitting} disabled={!token}>
        {submitLabel}
      </Button>
    </form>
  );
}
