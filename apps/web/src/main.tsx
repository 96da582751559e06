import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { createBrowserRouter, Navigate, RouterProvider } from 'react-router';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import './index.css';
import { applyStoredTheme } from './lib/theme.ts';
import { ApiError } from './lib/api.ts';
import { AppShell } from './layout/app-shell.tsx';
import { CampaignsPage } from './pages/campaigns-page.tsx';
import { AdminMailPage } from './pages/admin-mail-page.tsx';
import { NotFoundPage } from './pages/not-found-page.tsx';
import { SignInPage } from './pages/auth/sign-in-page.tsx';
import { SignUpPage } from './pages/auth/sign-up-page.tsx';
import { ForgotPasswordPage } from './pages/auth/forgot-password-page.tsx';
import { ResetPasswordPage } from './pages/auth/reset-password-page.tsx';

applyStoredTheme();

const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      retry: (count, error) => !(error instanceof ApiError && error.status >= 400 && error.status < 500) && count < 2,
      refetchOnWindowFocus: true,
    },
  },
});

const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/sign-up', element: <SignUpPage /> },
  { path: '/forgot-password', element: <ForgotPasswordPage /> },
  { path: '/reset-password', element: <ResetPasswordPage /> },
  {
    element: <AppShell />,
    children: [
      { index: true, element: <Navigate to="/campaigns" replace /> },
      { path: '/campaigns', element: <CampaignsPage /> },
      { path: '/admin/mail', element: <AdminMailPage /> },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
]);

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  </StrictMode>,
);
