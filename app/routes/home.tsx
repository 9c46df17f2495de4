// The public landing page: what Bendwise does for a school, a teacher and a family, and what it costs.
import { Link } from "react-router";
import type { Route } from "./+types/home";
import { FAMILY_SEAT_PRICE_CENTS, SCHOOL_SEAT_PRICE_CENTS, formatPrice } from "~/lib/pricing";

export const meta: Route.MetaFunction = () => [
  { title: "Bendwise — hands-on labs on how materials stretch, bend and break" },
  {
    name: "description",
    content:
      "A self-paced inquiry course for grades 6–10: load strips and sticks with a spring scale, read a ruler, and work out deformation, stiffness and elastic limits, with every calculation checked.",
  },
];

const audiences = [
  {
    who: "For students",
    what: "Predict, load a strip step by step, read the ruler, and work out deformation and stiffness. Every calculation is checked at once, with a hint that names the slip, and your place is kept for next time.",
  },
  {
    who: "For teachers",
    what: "Classes with their own sign-in codes, lessons assigned with due dates, and a gradebook that shows who has finished, who is stuck and on which step. Written answers and photos of set-ups to review.",
  },
  {
    who: "For schools",
    what: "Buy student seats for a school year by card or ask for an invoice with a purchase-order number. See how many seats are in use, invite your science teachers, and keep every receipt.",
  },
  {
    who: "For families",
    what: "A parent buys a seat, makes an account for a child — no e-mail address needed — and follows their progress through the course, lesson by lesson.",
  },
];

export default function Home() {
  return (
    <>
      <section className="mx-auto grid max-w-6xl gap-10 px-5 pt-14 pb-12 md:grid-cols-[1.3fr_1fr] md:items-center">
        <div>
          <p className="mb-3 font-bold uppercase tracking-wider text-ember text-[length:var(--text-step--1)]">
            Grades 6–10 · physical science · engineering design
          </p>
          <h1 className="mb-5 text-[length:var(--text-step-3)] md:text-[length:var(--text-step-4)]">
            How much does it bend? Let your students find out — and show their working.
          </h1>
          <p className="prose-reading mb-7 text-[length:var(--text-step-1)] text-ink-soft">
            Bendwise is a self-paced course built around a lab you can run with a spring scale, a ruler and a
            handful of strips. Students load, read, record and reason their way to stiffness, proportionality,
            elastic limits and why a glued stack beats a loose bundle.
          </p>
          <div className="flex flex-wrap gap-3">
            <Link to="/sign-in" className="btn">
              Sign in
            </Link>
            <Link to="/tools/analyse" className="btn btn-quiet">
              Try the readings analyser
            </Link>
            <Link to="/join/family" className="btn btn-quiet">
              Teaching at home? Make a family account
            </Link>
          </div>
        </div>
        <figure className="card" aria-label="A strip on two supports bending under a load">
          <svg viewBox="0 0 320 180" className="w-full" role="img" aria-labelledby="hero-fig-title">
            <title id="hero-fig-title">A strip resting on two supports sags in the middle under a hanging load; a ruler beside it reads the height.</title>
            <rect x="0" y="0" width="320" height="180" fill="#fbf8f1" />
            <path d="M30 70 Q160 112 290 70" stroke="#0d5c57" strokeWidth="8" fill="none" strokeLinecap="round" />
            <path d="M30 70 L290 70" stroke="#46524f" strokeWidth="1.5" strokeDasharray="6 5" fill="none" />
            <path d="M18 100 l12 -26 l12 26 z M278 100 l12 -26 l12 26 z" fill="#d9d2c3" stroke="#46524f" />
            <path d="M160 92 v40" stroke="#a8401a" strokeWidth="4" />
            <rect x="146" y="132" width="28" height="24" rx="4" fill="#a8401a" />
            <g stroke="#46524f" strokeWidth="1.5">
              <line x1="200" y1="40" x2="200" y2="150" />
              {Array.from({ length: 12 }, (_, i) => (
                <line key={i} x1="200" y1={40 + i * 10} x2={i % 5 === 0 ? 212 : 207} y2={40 + i * 10} />
              ))}
            </g>
            <text x="216" y="62" fontSize="12" fill="#1c2726" fontFamily="Atkinson Hyperlegible, sans-serif">unloaded</text>
            <text x="216" y="104" fontSize="12" fill="#1c2726" fontFamily="Atkinson Hyperlegible, sans-serif">loaded</text>
          </svg>
          <figcaption className="mt-2 text-[length:var(--text-step--1)] text-ink-soft">
            Deformation is the drop between the unloaded and the loaded reading.
          </figcaption>
        </figure>
      </section>

      <section aria-labelledby="who-heading" className="bg-spruce-wash">
        <div className="mx-auto max-w-6xl px-5 py-12">
          <h2 id="who-heading" className="mb-8 text-[length:var(--text-step-2)]">
            What Bendwise does, and for whom
          </h2>
          <ul className="grid gap-5 md:grid-cols-2 lg:grid-cols-4">
            {audiences.map((a) => (
              <li key={a.who} className="card">
                <h3 className="mb-2 text-[length:var(--text-step-1)]">{a.who}</h3>
                <p className="text-ink-soft">{a.what}</p>
              </li>
            ))}
          </ul>
        </div>
      </section>

      <section aria-labelledby="course-heading" className="mx-auto max-w-6xl px-5 py-12">
        <h2 id="course-heading" className="mb-4 text-[length:var(--text-step-2)]">
          The course in eight lessons
        </h2>
        <ol className="prose-reading list-decimal space-y-1 pl-6">
          <li>Measuring deformation: a reference reading, resolution and parallax</li>
          <li>Force and deformation: tables, charts and the stiffness of each reading</li>
          <li>Proportional or not: a best line through the origin</li>
          <li>Bundles side by side and in series</li>
          <li>Elastic, permanent, broken: return readings and the elastic limit</li>
          <li>Width, thickness and span: why a glued stack is far stiffer</li>
          <li>A home lab with two household materials</li>
          <li>A design challenge: a bridge of strips that must not sag too far</li>
        </ol>
        <p className="mt-4 text-ink-soft">
          Hands-on lessons carry the usual cautions — eye protection, loads within the scale's range, brittle
          pieces that snap — and defer to your school's lab-safety policy.
        </p>
      </section>

      <section id="pricing" aria-labelledby="pricing-heading" className="mx-auto max-w-6xl px-5 py-12">
        <h2 id="pricing-heading" className="mb-2 text-[length:var(--text-step-2)]">
          Pricing
        </h2>
        <p className="mb-8 text-ink-soft">One seat is one student for one school year. Teachers and parents never need a seat.</p>
        <div className="grid gap-5 md:grid-cols-2">
          <div className="card border-2 border-spruce">
            <h3 className="text-[length:var(--text-step-1)]">Schools</h3>
            <p className="my-3">
              <span className="font-reading text-[length:var(--text-step-3)] font-semibold">{formatPrice(SCHOOL_SEAT_PRICE_CENTS)}</span>{" "}
              per student seat per school year
            </p>
            <ul className="list-disc space-y-1 pl-5 text-ink-soft">
              <li>Pay by card, or ask for an invoice with a purchase-order number</li>
              <li>Unlimited teachers and classes</li>
              <li>Gradebook exports for your grade system</li>
            </ul>
            <p className="mt-4">
              <Link to="/sign-in" className="btn btn-quiet">
                School administrators: sign in to buy seats
              </Link>
            </p>
          </div>
          <div className="card border-2 border-ember">
            <h3 className="text-[length:var(--text-step-1)]">Families</h3>
            <p className="my-3">
              <span className="font-reading text-[length:var(--text-step-3)] font-semibold">{formatPrice(FAMILY_SEAT_PRICE_CENTS)}</span>{" "}
              per child per school year
            </p>
            <ul className="list-disc space-y-1 pl-5 text-ink-soft">
              <li>A child's account needs no e-mail address</li>
              <li>Follow each child's progress and written answers</li>
              <li>A short weekly summary, if you want one</li>
            </ul>
            <p className="mt-4">
              <Link to="/join/family" className="btn">
                Make a family account
              </Link>
            </p>
          </div>
        </div>
        <p className="mt-4 text-[length:var(--text-step--1)] text-ink-soft">Prices shown are for this demo installation.</p>
      </section>
    </>
  );
}
