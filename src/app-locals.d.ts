/// <reference types="astro/client" />
declare namespace App {
  interface Locals {
    user?: import('./lib/auth/session-user').SessionUser;
    /** Set by the request guard when the role may not open the area of the page asked for (the 403 page reads it). */
    denied?: { area: string; who: string; path: string };
  }
}
