import Link from "next/link";

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl p-10">
      <h1>Not found</h1>
      <p className="mt-2">This page does not exist, or your roles do not let you see it.</p>
      <p className="mt-4">
        <Link href="/">Go to your home page</Link>
      </p>
    </main>
  );
}
