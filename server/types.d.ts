import type { SessionUser } from '../shared/schemas/auth';

declare global {
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
    interface Request {
      valid: { body?: unknown; query?: unknown; params?: unknown };
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    createdAt: number;
  }
}

export {};
