/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** Who is asking: resolved by src/middleware.ts on every request (anonymous when nobody). */
    principal: import('./lib/shared/principal.ts').Principal;
  }
}
