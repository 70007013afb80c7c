import type { ReactNode } from 'react';
import { usePageTitle } from '../../../components/layout/app-shell';

export function AuthFrame({ title, children }: { title: string; children: ReactNode }) {
  usePageTitle(title);
  return (
    <main className="flex min-h-screen items-center justify-center bg-steel-900 p-4">
      <div className="w-full max-w-md rounded bg-white shadow-2xl">
        <div className="flex items-center gap-3 border-b-4 border-caution bg-steel-800 px-6 py-4 text-white">
          <img src="/favicon.svg" alt="" className="h-9 w-9" />
          <div>
            <p className="text-2xl font-bold tracking-wide">Kerfbook</p>
            <p className="text-sm text-steel-300">Consumables, maintenance and safety log</p>
          </div>
        </div>
        <div className="space-y-5 p-6">
          <h1 className="text-xl font-bold">{title}</h1>
          {children}
        </div>
      </div>
    </main>
  );
}
