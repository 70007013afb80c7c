import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { MachineRow } from '../../../../shared/schemas/machines';
import { stationKeys } from './keys';

export type StationLink = { code: string; name: string; location: string | null };

const STATION_KINDS = new Set(['torch', 'punch-head']);

/** Machines that have a station page worth opening: those with a torch or punch head below them. */
export async function getStations(): Promise<StationLink[]> {
  const rows = await api<MachineRow[]>('/machines');
  const top = new Map<string, MachineRow>();
  const rootOf = new Map<string, string>();
  for (const r of rows) {
    if (r.depth === 0) top.set(r.id, r);
    rootOf.set(r.id, r.depth === 0 ? r.id : (rootOf.get(r.parentId ?? '') ?? r.id));
  }
  const wanted = new Set(rows.filter((r) => STATION_KINDS.has(r.kind)).map((r) => rootOf.get(r.id)!));
  return [...top.values()].filter((m) => wanted.has(m.id)).map((m) => ({ code: m.code, name: m.name, location: m.location }));
}

export const getStationsQueryOptions = () => queryOptions({ queryKey: stationKeys.list(), queryFn: getStations });

export const useStations = () => useQuery(getStationsQueryOptions());
