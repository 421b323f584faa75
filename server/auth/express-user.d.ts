import type { SessionUser } from '../../shared/auth/roles';

declare global {
  namespace Express {
    // passport puts the deserialised user here.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

export {};
