// What our middleware adds to Express's request and session.
import type { Role } from '../../shared/api/roles';

declare global {
  namespace Express {
    interface User {
      id: string;
      email: string;
      displayName: string;
      memberships: { organizationId: string; organizationName: string; role: Role }[];
    }
    interface Request {
      // Set by requireMember: the signed-in user acting in their current organization.
      actor?: { userId: string; organizationId: string; role: Role };
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    organizationId?: string;
  }
}

export {};
