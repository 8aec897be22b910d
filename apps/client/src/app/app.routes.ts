import { Routes } from '@angular/router';
import { noAccessGuard, roleGuard, signedInGuard, signedOutGuard } from './core/auth/guards';

// Every feature is its own lazy chunk so the first load stays small on a site-office connection.
// Guards only steer navigation; the server checks the same rules on every request.
export const routes: Routes = [
  // Projects are the firm's everyday starting point, so the bare address opens them (or sign-in).
  { path: '', pathMatch: 'full', redirectTo: 'projects' },
  {
    path: 'sign-in',
    title: 'Sign in · Trabeate',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./core/auth/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: 'no-access',
    title: 'No access yet · Trabeate',
    canActivate: [noAccessGuard],
    loadComponent: () => import('./core/auth/no-access-page').then((m) => m.NoAccessPage),
  },
  {
    path: 'not-permitted',
    title: 'Not part of your role · Trabeate',
    canActivate: [signedInGuard],
    loadComponent: () => import('./core/auth/not-permitted-page').then((m) => m.NotPermittedPage),
  },
  {
    // Public: an invited person opens this before they have an account.
    path: 'invitations/:token',
    title: 'Invitation · Trabeate',
    loadComponent: () => import('./features/invitations/invitation-page').then((m) => m.InvitationPage),
  },
  {
    path: 'projects',
    title: 'Projects · Trabeate',
    canActivate: [signedInGuard],
    loadComponent: () => import('./features/projects/projects-page').then((m) => m.ProjectsPage),
  },
  {
    // Before `projects/:projectId`, so "new" is not read as a project id.
    path: 'projects/new',
    title: 'New project · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/projects/project-form-page').then((m) => m.ProjectFormPage),
  },
  {
    path: 'projects/:projectId',
    title: 'Project · Trabeate',
    canActivate: [signedInGuard],
    loadComponent: () => import('./features/projects/project-page').then((m) => m.ProjectPage),
  },
  {
    path: 'projects/:projectId/edit',
    title: 'Edit project · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/projects/project-form-page').then((m) => m.ProjectFormPage),
  },
  {
    path: 'drawings/numbering',
    title: 'Drawing numbering · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/drawings/numbering-settings-page').then((m) => m.NumberingSettingsPage),
  },
  {
    // Schemes are the firm's working files: clients are steered away here, and refused by the server.
    path: 'projects/:projectId/schemes',
    title: 'Schemes · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal', 'engineer')],
    loadComponent: () => import('./features/planning/schemes-page').then((m) => m.SchemesPage),
  },
  {
    // Before `:schemeId`, so "compare" is not read as a scheme id.
    path: 'projects/:projectId/schemes/compare',
    title: 'Compare schemes · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal', 'engineer')],
    loadComponent: () => import('./features/planning/compare-page').then((m) => m.ComparePage),
  },
  {
    path: 'projects/:projectId/schemes/:schemeId',
    title: 'Planning · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal', 'engineer')],
    loadComponent: () => import('./features/planning/planning-page').then((m) => m.PlanningPage),
  },
  {
    path: 'drawings',
    title: 'Drawings · Trabeate',
    canActivate: [signedInGuard],
    loadComponent: () => import('./features/drawings/drawings-page').then((m) => m.DrawingsPage),
  },
  {
    path: 'fees',
    title: 'Fees · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal', 'client')],
    loadComponent: () => import('./features/fees/fees-page').then((m) => m.FeesPage),
  },
  {
    // Where the payment page sends a client back; the server confirms what happened.
    path: 'fees/return',
    title: 'Payment · Trabeate',
    canActivate: [signedInGuard, roleGuard('client', 'principal')],
    loadComponent: () => import('./features/fees/payment-return-page').then((m) => m.PaymentReturnPage),
  },
  {
    path: 'firm/settings',
    title: 'Dates and time · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/firm-settings/firm-settings-page').then((m) => m.FirmSettingsPage),
  },
  {
    path: 'people',
    title: 'People · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/people/people-page').then((m) => m.PeoplePage),
  },
  {
    // Development only: the server answers 404 here unless it runs with the local mail fake.
    path: 'dev/outbox',
    title: 'Outbox · Trabeate',
    canActivate: [signedInGuard, roleGuard('principal')],
    loadComponent: () => import('./features/dev-outbox/outbox-page').then((m) => m.OutboxPage),
  },
  {
    // Public, so a signed-out person can still see whether the server and database are up.
    path: 'status',
    title: 'System status · Trabeate',
    loadComponent: () => import('./features/status/status-page').then((m) => m.StatusPage),
  },
  {
    path: '**',
    title: 'Page not found · Trabeate',
    loadComponent: () => import('./core/not-found-page').then((m) => m.NotFoundPage),
  },
];
