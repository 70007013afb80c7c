import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { Notice } from '../../../components/ui/notice';
import { useReturnToService } from '../api/change-state';

/** For technicians: return a machine stopped without a repair order (a planned stop, a check). */
export function ReturnToServiceButton({ code }: { code: string }) {
  const [asking, setAsking] = useState(false);
  const m = useReturnToService(code);
  return (
    <>
      <Button variant="secondary" onClick={() => setAsking(true)}>
        Return to service
      </Button>
      {m.isError ? (
        <Notice tone="danger" role="alert" title="Not returned">
          {m.error.message}
        </Notice>
      ) : null}
      <ConfirmDialog
        open={asking}
        title={`Return ${code} to service?`}
        confirmLabel="Return to service"
        busy={m.isPending}
        onCancel={() => setAsking(false)}
        onConfirm={() => m.mutate(null, { onSettled: () => setAsking(false) })}
      >
        Only when the machine is safe to run: guards refitted, tools removed, people clear.
      </ConfirmDialog>
    </>
  );
}
