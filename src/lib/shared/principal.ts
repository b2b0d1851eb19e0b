// Who is making a request. Plain data (no server imports), so pages and islands may receive it
// as a prop; it is resolved once per request in src/middleware.ts from the session cookie or an
// `Authorization: Bearer` token, always from the database (never trusted from the token).

export const ROLES = ['reader', 'contributor', 'curator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const LAB_ROLES = ['member', 'manager'] as const;
export type LabRole = (typeof LAB_ROLES)[number];

/** What an API token may do; a browser session has both. */
export const SCOPES = ['read', 'write'] as const;
export type Scope = (typeof SCOPES)[number];

export interface LabMembership {
  labId: string;
  slug: string;
  name: string;
  role: LabRole;
}

export interface AnonymousPrincipal {
  kind: 'anonymous';
}

export interface UserPrincipal {
  kind: 'user';
  id: string;
  email: string;
  name: string | null;
  role: Role;
  labs: LabMembership[];
  /** How the request proved who it is. */
  via: 'session' | 'token';
  scopes: Scope[];
  /** The API token's id when via === 'token'. */
  tokenId?: string;
}

export type Principal = AnonymousPrincipal | UserPrincipal;

export const ANONYMOUS: AnonymousPrincipal = Object.freeze({
  kind: 'anonymous',
}) as AnonymousPrincipal;

export function isUser(p: Principal): p is UserPrincipal {
  return p.kind === 'user';
}
