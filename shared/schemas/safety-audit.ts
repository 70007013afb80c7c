import { z } from 'zod';
import { paging } from './paging';

export const complianceQuery = z.object({
  /** Window for missed PPE checks and the charts. */
  days: z.coerce.number().int().min(7).max(366).default(30),
});
export const timelineQuery = z.object({ weeks: z.coerce.number().int().min(2).max(104).default(12) });

export type MachineCompliance = {
  machineId: string;
  machineCode: string;
  machineName: string;
  procedureVersion: number | null;
  inspectionStatus: 'none' | 'not-due' | 'due-soon' | 'due' | 'overdue';
  inspectionDueAt: string | null;
  lastInspectionAt: string | null;
  ppeExpected: number;
  ppeDone: number;
  ppeMissed: number;
  openLockouts: number;
  retrainingNeeded: number;
  /** In service with a pre-use list: it needs today's check. */
  preUseNeeded: boolean;
  /** Needs one and none was signed since the shop's day began. */
  preUseMissed: boolean;
  lastPreUseCheckAt: string | null;
};

export type ComplianceSummary = {
  days: number;
  machines: MachineCompliance[];
  totals: { overdueInspections: number; missedPpeChecks: number; openLockouts: number; retrainingNeeded: number; missedPreUseChecks: number };
};

export type TimelineWeek = {
  weekStart: string;
  ppeExpected: number;
  ppeDone: number;
  ppeCompliancePct: number | null;
  lockouts: number;
  signOffs: number;
  inspectionsCurrentPct: number | null;
};

export const SAFETY_EVENT_KIND_LABELS = { refused: 'Refused', alarm: 'Alarm' } as const;

/** Plain words for the actions a safety event names; an action not listed shows as stored. */
const SAFETY_EVENT_ACTION_LABELS: Record<string, string> = {
  'lockout.apply': 'Apply a lockout',
  'lockout.verify': 'Verify zero energy',
  'lockout.join': 'Join a group lockout',
  'lockout.leave': 'Take a personal lock off',
  'lockout.handover': 'Hand a lockout over',
  'lockout.accept-handover': 'Accept a handover',
  'lockout.release': 'Release a lockout',
  'lockout.absent-removal': "Start removing an absent person's lock",
  'procedure.approve': 'Approve a procedure version',
  'meter.advance-while-locked': 'Counter rose while locked out',
};
export const safetyEventActionLabel = (action: string) =>
  SAFETY_EVENT_ACTION_LABELS[action] ?? (action.startsWith('lockout.absent-removal.') ? "Sign a step of an absent person's lock removal" : action);

export const listSafetyEventsQuery = paging.extend({
  kind: z.enum(['refused', 'alarm']).optional(),
  machineId: z.uuid({ message: 'Not a valid machine id' }).optional(),
});

/** A refused attempt or a raised alarm, as the safety audit lists them beside the signatures. */
export type SafetyEventRow = {
  id: string;
  at: string;
  kind: 'refused' | 'alarm';
  action: string;
  reason: string;
  personId: string | null;
  personName: string | null;
  machineId: string | null;
  machineCode: string | null;
  subjectId: string | null;
};
