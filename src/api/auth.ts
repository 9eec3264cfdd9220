import { sessionResponseSchema, type SessionResponse, type SignInRequest } from '@shared/api/auth';
import { z } from 'zod';
import type { OwnPasswordChange } from '@shared/api/users';
import { request, setCsrfToken } from './http';

async function withToken(promise: Promise<SessionResponse>): Promise<SessionResponse> {
  const session = await promise;
  setCsrfToken(session.csrfToken);
  return session;
}

export const fetchSession = () => withToken(request('GET', '/auth/session', sessionResponseSchema));
export const signIn = (input: SignInRequest) => withToken(request('POST', '/auth/sign-in', sessionResponseSchema, input));
export const signOut = () => withToken(request('POST', '/auth/sign-out', sessionResponseSchema));
export const switchOrganization = (organizationId: string) =>
  withToken(request('POST', '/auth/organization', sessionResponseSchema, { organizationId }));
export const changeOwnPassword = (input: OwnPasswordChange) => request('POST', '/auth/password', z.undefined(), input);
