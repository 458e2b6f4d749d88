import Link from "next/link";

export default function NotFound() {
  return (
    <div className="mx-auto max-w-md px-6 py-24 text-center">
      <p className="text-sm font-semibold uppercase tracking-wide text-lagoon-700">Not found</p>
      <h1 className="mt-2 text-2xl font-semibold">There is nothing here for you</h1>
      <p className="mt-3 text-sm text-muted">
        The page does not exist, or it belongs to an account or organisation you cannot see.
      </p>
      <Link href="/" className="mt-6 inline-block font-medium text-lagoon-700 underline">
        Back to your overview
      </Link>
    </div>
  );
}
