// Every entity the ORM knows about. A feature module adds its entities here.
import { Organization } from './modules/organizations/organization.entity';
import { User, Membership, UserToken } from './modules/users/user.entity';
import { ActivityEvent } from './modules/activity-log/activity-event.entity';
import { OutboxMail } from './mail/outbox.entity';
import { Machine } from './modules/machines/machine.entity';
import { MachinePhoto } from './modules/machines/machine-photo.entity';
import { FailureCode, MachineDowntime, MachineStateChange } from './modules/machines/machine-state.entity';
import { Meter, MeterReading } from './modules/meters/meter.entity';
import { PartType, StockMove } from './modules/stock/stock.entity';
import { MaintenancePlan } from './modules/plans/plan.entity';
import { WorkOrder, WorkOrderPart, WorkOrderAttachment, WorkOrderCounter, NotifyPreference } from './modules/work-orders/work-order.entity';
import { OilTarget, OilAnalysis } from './modules/oil-analysis/oil-analysis.entity';
import { CalendarFeed } from './modules/calendar-feed/calendar-feed.entity';
import { JobRun } from './modules/job-runs/job-run.entity';
import { safetyEntities } from './modules/safety/index';
import { ConsumableChange, ConsumableInstall, ConsumablePhoto, CutCheck } from './modules/station/consumable.entity';
import { PunchTool, ToolSharpening } from './modules/punch-tools/punch-tool.entity';

export const entities = [
  Organization,
  User,
  Membership,
  UserToken,
  ActivityEvent,
  OutboxMail,
  Machine,
  Meter,
  MeterReading,
  PartType,
  StockMove,
  MaintenancePlan,
  WorkOrder,
  WorkOrderPart,
  WorkOrderAttachment,
  WorkOrderCounter,
  NotifyPreference,
  OilTarget,
  OilAnalysis,
  CalendarFeed,
  JobRun,
  ...safetyEntities,
  ConsumableChange,
  ConsumableInstall,
  ConsumablePhoto,
  CutCheck,
  PunchTool,
  ToolSharpening,
  MachinePhoto,
  MachineDowntime,
  MachineStateChange,
  FailureCode,
];
