/** The message above a form for an error that belongs to no single field. */
export function FormError({ message }: { message: string | null | undefined }) {
  if (!message) return null;
  return (
    <p role="alert" data-testid="form-error" className="rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700">
      {message}
    </p>
  );
}
