import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { orgSettingsSchema, type OrgSettingsInput } from '../../../../shared/schemas/organization';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useShopFormat } from '../../../lib/format';
import { formatDateTime } from '../../../../shared/locale';
import { isTimeZone } from '../../../../shared/locale-input';
import { useUpdateOrganization, type OrganizationSettings } from '../api/organization';

const zones = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : [];

export function OrgSettingsForm({ org }: { org: OrganizationSettings }) {
  const update = useUpdateOrganization();
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const { register, handleSubmit, setError, watch, formState } = useForm<OrgSettingsInput>({
    resolver: zodResolver(orgSettingsSchema),
    defaultValues: { name: org.name, timeZone: org.timeZone },
  });
  const zone = watch('timeZone');
  const { locale } = useShopFormat();
  const preview = isTimeZone(zone) ? formatDateTime(new Date(), { timeZone: zone, locale }) : '';
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    try {
      await update.mutateAsync(values);
      setMessage({ tone: 'safe', text: 'Saved. Dates everywhere now use this time zone.' });
    } catch (err) {
      const rest = applyServerErrors(err, setError, ['name', 'timeZone']);
      if (rest) setMessage({ tone: 'danger', text: rest });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Site settings" className="max-w-xl space-y-4">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      <TextField label="Shop name" error={formState.errors.name?.message} {...register('name')} />
      <TextField
        label="Time zone"
        list="iana-zones"
        autoComplete="off"
        error={formState.errors.timeZone?.message}
        hint={preview ? `Schedules, due dates and signatures use this clock. Now there: ${preview}` : 'An IANA name such as America/Chicago'}
        {...register('timeZone')}
      />
      <datalist id="iana-zones">
        {zones.map((z) => (
          <option key={z} value={z} />
        ))}
      </datalist>
      <Button type="submit" busy={formState.isSubmitting}>
        Save settings
      </Button>
    </form>
  );
}
