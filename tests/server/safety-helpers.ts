// Shared set-up for the safety-log tests: a shop with machines, signed-in roles and an approved procedure.
import '../../shared/luxon-clock';
import pg from 'pg';
import { DateTime } from 'luxon';
import type { EntityManager } from '@mikro-orm/postgresql';
import { get, makeShop, post, put, signIn, type SignedIn, type TestShop } from '../setup/test-app';

export { get, post, put };
import { Machine } from '../../server/modules/machines/machine.entity';
import { DEMO_PASSWORD } from '../../seed/factories';
import { ROLES, type Role } from '../../shared/permissions';
import type { ProcedureContent } from '../../shared/schemas/safety-procedures';
import type { AppHandle } from '../../server/app';
import { ownerUrlFor } from '../../server/db-roles';

export const PASSWORD = DEMO_PASSWORD;

/** Today's date in the test shops' zone (makeShop: America/Chicago): dates people enter are local, and from 00:00 to 06:00 UTC the UTC date is already tomorrow there. */
export const shopToday = () => DateTime.now().setZone('America/Chicago').toISODate() as string;

export function cellProcedure(title = 'Full lockout of the punch/plasma cell'): ProcedureContent {
  return {
    title,
    scope: 'Service inside the guarded area of the cell: punch head, torch, clamps and table.',
    sources: [
      {
        key: 'E1',
        kind: 'electrical',
        description: 'Main supply to the cell cabinet',
        magnitude: '400 V 3-phase, 63 A',
        isolationDevice: 'Main disconnect Q0',
        location: 'Cabinet door, left side',
        relieveMethod: 'Wait 5 min for the drive capacitors to discharge',
        verifyMethod: 'Try start; test L1-L2-L3 to earth with a tested voltage tester',
      },
      {
        key: 'H1',
        kind: 'hydraulic',
        description: 'Punch ram hydraulics with accumulator',
        magnitude: '210 bar, 4 L accumulator',
        isolationDevice: 'Pump motor via E1; accumulator dump valve V7',
        location: 'Hydraulic unit, rear',
        relieveMethod: 'Open dump valve V7 until the gauge reads 0 bar',
        verifyMethod: 'Gauge PG2 reads 0 bar; ram does not move on jog',
      },
      {
        key: 'PL1',
        kind: 'plasma-power',
        description: 'Plasma power source for the torch',
        magnitude: '400 V in, 300 V open-circuit out',
        isolationDevice: 'Plasma source disconnect Q5',
        location: 'Plasma cabinet, front',
        relieveMethod: 'Wait 2 min after switch-off',
        verifyMethod: 'Source display dark; try arc start from the control',
      },
    ],
    steps: {
      prepare: ['Tell the operator and affected employees that the cell will be locked out.'],
      shutdown: ['Stop the program, park the head, press the stop button.'],
      isolate: ['Open Q0 and Q5.'],
      apply: ['Put your lock and tag on Q0, Q5 and V7.'],
      relieve: ['Open V7 and wait until PG2 reads 0 bar.'],
      verify: ['Try to start the cell from the panel; test for voltage at Q0 outgoing terminals.'],
    },
    release: ['Remove tools and refit guards.', 'Make sure everyone is clear.', 'Tell affected employees; remove your own locks.'],
  };
}

export type SafetyShop = TestShop & { machineId: string; machineCode: string; otherMachineId: string; s: Record<Role, SignedIn> };

export async function makeSafetyShop(app: AppHandle['app'], em: EntityManager, label: string): Promise<SafetyShop> {
  const shop = await makeShop(em, label);
  const m1 = em.create(Machine, { organization: shop.orgId, kind: 'punch-plasma-cell', code: 'C1', name: 'Cell 1', active: true });
  const m2 = em.create(Machine, { organization: shop.orgId, kind: 'plasma-table', code: 'PT1', name: 'Plasma table', active: true });
  await em.flush();
  const s = {} as Record<Role, SignedIn>;
  for (const role of ROLES) s[role] = await signIn(app, shop.users[role].email);
  return { ...shop, machineId: m1.id, machineCode: 'C1', otherMachineId: m2.id, s };
}

/**
 * Creates a procedure for the shop's cell (the technician drafts, the safety officer approves: nobody
 * approves their own draft) and, unless `trained` is empty, records authorized-employee training
 * for the technician and the safety officer, who may then apply locks with it. Returns its id.
 */
export async function approvedProcedure(
  shop: SafetyShop,
  content = cellProcedure(),
  machineId = shop.machineId,
  trained: Role[] = ['technician', 'safety'],
): Promise<string> {
  const created = await post(shop.s.technician, '/safety/procedures', { ...content, machineId }).expect(201);
  await post(shop.s.safety, `/safety/procedures/${created.body.id}/versions/1/approve`, { password: PASSWORD }).expect(201);
  for (const role of trained) await trainAuthorized(shop, role, created.body.id);
  return created.body.id as string;
}

/** Signed authorized-employee training (1910.147(c)(7)(i)(A)) of one of the shop's people on the procedure's current version. */
export async function trainAuthorized(
  shop: SafetyShop,
  role: Role,
  procedureId: string,
  kind: 'authorized' | 'minor-servicing' = 'authorized',
  minorTask?: string,
) {
  await post(shop.s.safety, '/safety/training', {
    userId: shop.users[role].userId,
    procedureId,
    kind,
    minorTask,
    trainedOn: shopToday(),
    password: PASSWORD,
  }).expect(201);
}

export const lockPoints = (prefix = 'L') => [
  { sourceKey: 'E1', device: 'lock-and-tag', lockNumber: `${prefix}-01`, tagNumber: 'T-01' },
  { sourceKey: 'H1', device: 'valve-cover', lockNumber: `${prefix}-02` },
  { sourceKey: 'PL1', device: 'lock-and-tag', lockNumber: `${prefix}-03` },
];

/** A connection as the database superuser, for tampering the way an attacker with full access would. */
export async function superuser(): Promise<pg.Client> {
  const url = new URL(process.env.DATABASE_URL!);
  url.username = 'postgres';
  url.password = process.env.KERFBOOK_DB_SUPER_PASSWORD ?? 'kerfbook-super';
  const client = new pg.Client({ connectionString: url.toString() });
  await client.connect();
  return client;
}

/** A connection as the role that owns the tables and runs migrations. */
export async function ownerRole(): Promise<pg.Client> {
  const client = new pg.Client({ connectionString: ownerUrlFor(process.env.DATABASE_URL!) });
  await client.connect();
  return client;
}

/** A plain connection as the application's own role (the one the server uses). */
export async function appRole(): Promise<pg.Client> {
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  return client;
}

export async function countSignOffs(orgId: string): Promise<number> {
  const c = await appRole();
  try {
    const r = await c.query('select count(*)::int as n from safety_sign_off where organization_id = $1', [orgId]);
    return r.rows[0].n;
  } finally {
    await c.end();
  }
}
