import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { createBrowserRouter, Navigate, RouterProvider } from 'react-router';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import './index.css';
import { applyStoredTheme } from './lib/theme.ts';
import { ApiError } from './lib/api.ts';
import { ToastProvider } from './lib/toast.tsx';
import { AppShell } from './layout/app-shell.tsx';
import { CampaignsPage } from './pages/campaigns-page.tsx';
import { AdminMailPage } from './pages/admin-mail-page.tsx';
import { AccountPage } from './pages/account-page.tsx';
import { LabKitPage } from './pages/lab-kit-page.tsx';
import { NotFoundPage } from './pages/not-found-page.tsx';
import { SignInPage } from './pages/auth/sign-in-page.tsx';
import { SignUpPage } from './pages/auth/sign-up-page.tsx';
import { ForgotPasswordPage } from './pages/auth/forgot-password-page.tsx';
import { ResetPasswordPage } from './pages/auth/reset-password-page.tsx';
import { InvitationPage } from './pages/invitation-page.tsx';
import { CampaignLayout } from './pages/campaign/campaign-layout.tsx';
import { OverviewPage } from './pages/campaign/overview-page.tsx';
import { PlanPage } from './pages/campaign/plan-page.tsx';
import { KitPage } from './pages/campaign/kit-page.tsx';
import { TapPage } from './pages/campaign/tap-page.tsx';
import { ReviewPage } from './pages/campaign/review-page.tsx';
import { ModesPage } from './pages/campaign/modes-page.tsx';
import { HandoverPage } from './pages/campaign/handover-page.tsx';

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
  { path: '/invitations/:token', element: <InvitationPage /> },
  {
    element: <AppShell />,
    children: [
      { index: true, element: <Navigate to="/campaigns" replace /> },
      { path: '/campaigns', element: <CampaignsPage /> },
      {
        path: '/campaigns/:campaignId',
        element: <CampaignLayout />,
        children: [
          { index: true, element: <OverviewPage /> },
          { path: 'plan', element: <PlanPage /> },
          { path: 'kit', element: <KitPage /> },
          { path: 'tap', element: <TapPage /> },
          { path: 'review', element: <ReviewPage /> },
          { path: 'modes', element: <ModesPage /> },
          { path: 'handover', element: <HandoverPage /> },
          { path: '*', element: <NotFoundPage /> },
        ],
      },
      { path: '/admin/mail', element: <AdminMailPage /> },
      { path: '/account', element: <AccountPage /> },
      { path: '/lab', element: <LabKitPage /> },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
]);

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <ToastProvider>
        <RouterProvider router={router} />
      </ToastProvider>
    </QueryClientProvider>
  </StrictMode>,
);
