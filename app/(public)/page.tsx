import Link from "next/link";
import { Notice } from "@/components/ui/notice";

const STEPS = [
  {
    title: "Tell us about the set",
    text: "Maker and model as printed, the bands on the dial, what it does or does not do, and a few photos of the front, back, chassis and labels.",
  },
  {
    title: "We price the work",
    text: "A technician reads your photos and builds an itemised estimate: safety work, new capacitors, alignment of every band, tests and burn-in.",
  },
  {
    title: "Approve and pay a deposit",
    text: "You see each line with the reason for it. Approve online and pay the deposit; nothing starts before you say yes.",
  },
  {
    title: "Ship or drop it off",
    text: "We send packing notes. At the bench every reading is recorded: IF peak, oscillator and band edges, leakage current on mains sets.",
  },
  {
    title: "Get it back with a certificate",
    text: "Pay the balance and your set comes home with a signed warranty certificate listing the measured band edges, checkable by anyone.",
  },
];

export default function HomePage() {
  return (
    <div className="space-y-12">
      <section className="grid gap-8 md:grid-cols-[3fr_2fr] md:items-center">
        <div className="space-y-4">
          <p className="text-sm font-semibold uppercase tracking-[0.2em] text-ember">Port Alder · since the days of the valve</p>
          <h1 className="text-4xl font-bold leading-tight sm:text-5xl">Your old radio, made safe and brought back on tune.</h1>
          <p className="max-w-prose text-lg text-bakelite-soft">
            Kestrel Lane Wireless restores tube and transistor receivers sent in from near and far: AC/DC table sets, transformer consoles,
            portables, shortwave and FM. Every set leaves with its band edges measured and a signed warranty certificate.
          </p>
          <div className="flex flex-wrap gap-3">
            <Link href="/sign-up" className="btn-primary">
              Request a quote
            </Link>
            <Link href="/sign-in" className="btn-secondary">
              Sign in to follow your set
            </Link>
          </div>
        </div>
        <figure className="card p-5" aria-label="A sample of a measured band-edge table">
          <figcaption className="text-sm font-semibold text-bakelite-muted">From a certificate: measured band edges</figcaption>
          <table className="dense-table mt-2">
            <thead>
              <tr>
                <th scope="col">Band</th>
                <th scope="col">Dial</th>
                <th scope="col">Measured</th>
                <th scope="col">Verdict</th>
              </tr>
            </thead>
            <tbody className="figure">
              <tr>
                <td>MW low</td>
                <td>540 kHz</td>
                <td>538 kHz</td>
                <td>✓ within tolerance</td>
              </tr>
              <tr>
                <td>MW high</td>
                <td>1600 kHz</td>
                <td>1608 kHz</td>
                <td>✓ within tolerance</td>
              </tr>
            </tbody>
          </table>
          <p className="mt-3 text-sm">
            Buying a set that came through our workshop?{" "}
            <Link href="/verify" className="font-semibold">
              Check its certificate
            </Link>{" "}
            with the code printed on it.
          </p>
        </figure>
      </section>

      <section aria-labelledby="how" className="space-y-4">
        <h2 id="how" className="text-2xl font-bold">
          How a mail-in restoration works
        </h2>
        <ol className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5">
          {STEPS.map((s, i) => (
            <li key={s.title} className="card p-4">
              <p className="figure text-sm text-ember">Step {i + 1}</p>
              <h3 className="mt-1 text-lg font-semibold">{s.title}</h3>
              <p className="mt-1 text-sm text-bakelite-soft">{s.text}</p>
            </li>
          ))}
        </ol>
      </section>

      <section aria-labelledby="before" className="max-w-prose space-y-3">
        <h2 id="before" className="text-2xl font-bold">
          Before you send it
        </h2>
        <Notice tone="caution" title="Please do not plug in an unrestored set">
          <p>
            Capacitors and cords more than fifty years old can short, overheat and catch fire, and a failed part can put mains voltage where
            you can touch it.
          </p>
          <p>
            AC/DC sets (no power transformer) can have a live chassis even when switched off. Remove batteries from portables before
            shipping.
          </p>
          <p>These notes are general guidance. Work on mains equipment should follow your local codes and licensed practice.</p>
        </Notice>
      </section>
    </div>
  );
}
