import { Routes } from '@angular/router';

// Every feature is its own lazy chunk so the first load stays small on a site-office connection.
export const routes: Routes = [
  // Projects are the firm's everyday starting point, so the bare address opens them.
  { path: '', pathMatch: 'full', redirectTo: 'projects' },
  {
    path: 'projects',
    title: 'Projects · Trabeate',
    loadComponent: () => import('./features/projects/projects-page').then((m) => m.ProjectsPage),
  },
  {
    path: 'drawings',
    title: 'Drawings · Trabeate',
    loadComponent: () => import('./features/drawings/drawings-page').then((m) => m.DrawingsPage),
  },
  {
    path: 'fees',
    title: 'Fees · Trabeate',
    loadComponent: () => import('./features/fees/fees-page').then((m) => m.FeesPage),
  },
  {
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
