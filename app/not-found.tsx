import Link from "next/link";

export default function NotFound() {
  return (
    <section className="card">
      <h1>Not found</h1>
      <p>That record does not exist. <Link href="/">Back to the reviews</Link>.</p>
    </section>
  );
}
