"use client";

export default function StudyError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div role="alert" className="rounded border border-brick bg-brick-light p-4">
      <h1 className="text-lg">This page could not be shown</h1>
      <p className="text-sm">Nothing was changed. {error.digest ? `Reference: ${error.digest}.` : ""}</p>
      <button className="btn mt-3" onClick={reset}>
        Try again
      </button>
    </div>
  );
}
