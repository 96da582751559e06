import { Link } from 'react-router';

export function NotFoundPage() {
  return (
    <div className="mx-auto max-w-md py-16 text-center">
      <h1 className="text-xl font-semibold">Page not found</h1>
      <p className="mt-2 text-sm text-[var(--muted)]">This address does not exist, or you are not a member of what it points to.</p>
      <Link to="/campaigns" className="mt-4 inline-block text-accent hover:underline">
        Go to your campaigns
      </Link>
    </div>
  );
}
