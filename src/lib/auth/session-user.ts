/** The caller as the server sees it after the request guard. */
import type { Role } from './permissions';

export type SessionUser = {
  id: number;
  email: string;
  name: string;
  role: Role;
  /** null = every depot; else the ids of the depots this person may see. */
  depotIds: number[] | null;
  via: 'session' | 'token';
};
