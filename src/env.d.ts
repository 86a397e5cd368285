/// <reference path="../.astro/types.d.ts" />

declare namespace App {
  interface Locals {
    user: import('./server/auth').AuthSession['user'] | null;
    session: import('./server/auth').AuthSession['session'] | null;
  }
}
