import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useCreateSupplier, useSuppliers } from '../api/suppliers';

/** The shop's suppliers; a part names its supplier on the stock page. */
export function Suppliers({ canAdd }: { canAdd: boolean }) {
  const q = useSuppliers();
  const create = useCreateSupplier();
  const [name, setName] = useState('');
  const [email, setEmail] = useState('');
  const [error, setError] = useState<string | null>(null);
  const add = async () => {
    setError(null);
    try {
      await create.mutateAsync({ name, email });
      setName('');
      setEmail('');
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Not added');
    }
  };
  return (
    <div className="space-y-3">
      {q.data && q.data.length === 0 ? <EmptyState title="No suppliers yet" /> : null}
      <ul className="space-y-1">
        {(q.data ?? []).map((s) => (
          <li key={s.id}>
            <span className="font-semibold">{s.name}</span>
            <span className="text-sm text-steel-700">
              {s.email ? ` · ${s.email}` : ''} · {s.parts} parts
            </span>
          </li>
        ))}
      </ul>
      {canAdd ? (
        <div className="grid gap-3 md:grid-cols-3">
          <TextField label="Supplier name" value={name} onChange={(e) => setName(e.target.value)} />
          <TextField label="Order e-mail (optional)" value={email} onChange={(e) => setEmail(e.target.value)} />
          <div className="flex items-end">
            <Button variant="secondary" busy={create.isPending} onClick={add}>
              Add supplier
            </Button>
          </div>
          {error ? (
            <div className="md:col-span-3">
              <Notice tone="danger" role="alert">
                {error}
              </Notice>
            </div>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
