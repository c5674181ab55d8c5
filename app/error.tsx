"use client";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <section className="card">
      <h1>Something went wrong</h1>
      <p className="form-error" data-testid="page-error">{error.message}{error.digest ? ` (reference ${error.digest})` : ""}</p>
      <button onClick={reset}>Try again</button>
    </section>
  );
}
