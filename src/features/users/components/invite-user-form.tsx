import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { inviteUserSchema, type InviteUserInput } from '../../../../shared/schemas/users';
import { ROLES, ROLE_LABELS } from '../../../../shared/permissions';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useInviteUser } from '../api/invite-user';

export function InviteUserForm() {
  const invite = useInviteUser();
  const [formError, setFormError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<InviteUserInput>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { role: 'operator' },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSentTo(null);
    try {
      await invite.mutateAsync(values);
      setSentTo(values.email);
      reset({ name: '', email: '', role: values.role });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['name', 'email', 'role']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Invite someone" className="grid gap-4 md:grid-cols-[1fr_1fr_14rem_auto] md:items-start">
      <div className="md:col-span-4 space-y-2">
        <FormMessages error={formError} />
        {sentTo ? (
          <Notice tone="safe" role="status">
            Invitation sent to {sentTo}. The link works once, for seven days.
          </Notice>
        ) : null}
      </div>
      <TextField label="Name" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
      <TextField label="E-mail" type="email" autoComplete="off" error={formState.errors.email?.message} {...register('email')} />
      <SelectField
        label="Role"
        error={formState.errors.role?.message}
        options={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
        {...register('role')}
      />
      <Button type="submit" busy={formState.isSubmitting} className="md:mt-6">
        Send invitation
      </Button>
    </form>
  );
}
