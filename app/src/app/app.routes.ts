import type { Routes } from '@angular/router';
import { signedInGuard } from './core/signed-in-guard';

export const routes: Routes = [
  { path: 'sign-in', title: 'Sign in · Kinetwin', loadComponent: () => import('./auth/sign-in').then((m) => m.SignIn) },
  {
    path: '',
    canActivate: [signedInGuard],
    loadComponent: () => import('./shell/signed-in-shell').then((m) => m.SignedInShell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'library' },
      { path: 'library', title: 'Library · Kinetwin', loadComponent: () => import('./library/library').then((m) => m.Library) },
      { path: 'bench/:id', title: 'Bench · Kinetwin', loadComponent: () => import('./bench/bench').then((m) => m.Bench) },
    ],
  },
  { path: '**', redirectTo: 'library' },
];
