// Every entity the ORM knows about. A feature module adds its entities here.
import { Organization } from './modules/organizations/organization.entity';
import { User, Membership, UserToken } from './modules/users/user.entity';
import { AuditEvent } from './modules/audit/audit-event.entity';
import { OutboxMail } from './mail/outbox.entity';
import { Machine } from './modules/machines/machine.entity';
import { Meter, MeterReading } from './modules/meters/meter.entity';
import { PartType, StockMove } from './modules/stock/stock.entity';

export const entities = [Organization, User, Membership, UserToken, AuditEvent, OutboxMail, Machine, Meter, MeterReading, PartType, StockMove];
