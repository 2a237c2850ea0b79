import type { Routes } from '@angular/router';
import { adminGuard } from './core/admin-guard';
import { signedInGuard } from './core/signed-in-guard';

export const routes: Routes = [
  { path: 'sign-in', title: 'Sign in · Kinetwin', loadComponent: () => import('./auth/sign-in').then((m) => m.SignIn) },
  { path: 'sign-up', title: 'Create an account · Kinetwin', loadComponent: () => import('./auth/sign-up').then((m) => m.SignUp) },
  { path: 'accept-invitation', title: 'Join a team · Kinetwin', loadComponent: () => import('./auth/accept-invitation').then((m) => m.AcceptInvitation) },
  { path: 'forgot-password', title: 'Reset your password · Kinetwin', loadComponent: () => import('./auth/reset-request').then((m) => m.ResetRequest) },
  { path: 'reset-password', title: 'Choose a new password · Kinetwin', loadComponent: () => import('./auth/reset-complete').then((m) => m.ResetComplete) },
  {
    path: '',
    canActivate: [signedInGuard],
    loadComponent: () => import('./shell/signed-in-shell').then((m) => m.SignedInShell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'library' },
      { path: 'library', title: 'Library · Kinetwin', loadComponent: () => import('./library/library').then((m) => m.Library) },
      // E-mailed links point here (`/library/:id?revision=n`).
      { path: 'library/:id', title: 'Scenario · Kinetwin', loadComponent: () => import('./scenario/scenario-page').then((m) => m.ScenarioPage) },
      { path: 'handed-to-me', title: 'Handed to me · Kinetwin', loadComponent: () => import('./handoffs/handed-to-me').then((m) => m.HandedToMe) },
      { path: 'team', title: 'Team · Kinetwin', canActivate: [adminGuard], loadComponent: () => import('./team/team-page').then((m) => m.TeamPage) },
      { path: 'mailbox', title: 'Dev mailbox · Kinetwin', canActivate: [adminGuard], loadComponent: () => import('./mailbox/mailbox').then((m) => m.Mailbox) },
      { path: 'bench/:id', title: 'Bench · Kinetwin', loadComponent: () => import('./bench/bench').then((m) => m.Bench) },
    ],
  },
  { path: '**', redirectTo: 'library' },
];
