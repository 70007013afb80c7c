import { useState } from 'react';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { Button } from '../../../components/ui/button';
import { CountersForm } from './counters-form';

/** A real button, not a disclosure triangle: on a phone the collapsed form must look tappable. */
export function RecordCountersPanel({ meters }: { meters: MeterRow[] }) {
  const [open, setOpen] = useState(false);
  return (
    <section aria-labelledby="record-counters" className="space-y-3 rounded border border-steel-200 bg-white p-4 shadow-sm">
      <h2 id="record-counters" className="text-xl font-bold">
        Counters
      </h2>
      <p className="text-steel-700">Type in what the control shows; fields left empty are skipped.</p>
      <Button
        className="min-h-[4rem] w-full text-xl"
        variant={open ? 'secondary' : 'primary'}
        aria-expanded={open}
        aria-controls="record-counters-form"
        onClick={() => setOpen((o) => !o)}
      >
        {open ? 'Close the counter form' : 'Record counters'}
      </Button>
      {open ? (
        <div id="record-counters-form">
          <CountersForm meters={meters} />
        </div>
      ) : null}
    </section>
  );
}
