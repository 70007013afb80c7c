import type { Role } from '../../shared/permissions';

export type Principal = {
  userId: string;
  orgId: string;
  role: Role;
  name: string;
  email: string;
  /** The shop's name and IANA time zone, read with the membership so a request needs no second query. */
  orgName: string;
  timeZone: string;
  /** The shop's locale for numbers and month names (shared/locale.ts). */
  locale: string;
};

declare module 'express-session' {
  interface SessionData {
    userId?: string;
    orgId?: string;
    csrfToken?: string;
    /** When the user signed in; the absolute timeout counts from here. */
    signedInAt?: number;
  }
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      principal?: Principal;
    }
  }
}
