import Link from "next/link";

export default function DesignPage() {
  return (
    <>
      <h1>Design studies</h1>
      <section className="card">
        <ul>
          <li><Link href="/design/calibrate">Calibrate</Link>: fit the product&apos;s time constant to a probe test and keep it as an effective pack.</li>
          <li><Link href="/design/profiles">Profiles</Link>: build the ambient a route may throw at the product (hold, ramp, repeat).</li>
          <li><Link href="/design/size">Size</Link>: the least insulation or coolant (or the warmest start) that keeps every rule passing, and the uncertainty of the prediction.</li>
        </ul>
      </section>
    </>
  );
}
