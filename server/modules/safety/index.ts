// The safety module's entities, for server/entities.ts.
import { SafetySignOff, SafetyChainHead, SafetyChainCopy } from './sign-off.entity';
import { EnergyProcedure, ProcedureVersion, ProcedurePhoto } from './procedure.entity';
import { LockoutSession, LockoutPoint, LockoutMember } from './lockout.entity';
import { SafetyEvent } from './safety-event.entity';
import { AbsentLockRemoval } from './absent-removal.entity';
import { PreUseCheck } from './pre-use-check.entity';
import { LockoutTestWindow } from './testing-window.entity';
import { OutsideParty } from './outside-party.entity';
import { PpeRequirement, PpeCheck, PeriodicInspection, TrainingRecord, FireWatch, SafetyTask } from './records.entity';

export const safetyEntities = [
  SafetySignOff,
  SafetyChainHead,
  SafetyChainCopy,
  EnergyProcedure,
  ProcedureVersion,
  ProcedurePhoto,
  LockoutSession,
  LockoutPoint,
  LockoutMember,
  PpeRequirement,
  PpeCheck,
  PeriodicInspection,
  TrainingRecord,
  FireWatch,
  SafetyTask,
  SafetyEvent,
  AbsentLockRemoval,
  PreUseCheck,
  LockoutTestWindow,
  OutsideParty,
];
