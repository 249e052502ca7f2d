import { PageHeader } from "@/components/ui";
import { requireUser } from "@/lib/http/session";
import { analysisCatalogue } from "@/lib/server/analyses/catalogue";
import { CalculatorCard, type CalculatorView } from "./_components/calculator-card";

export const metadata = { title: "Calculators" };

export default async function CalculatorsPage() {
  await requireUser();
  const { calculators, caution } = analysisCatalogue();
  return (
    <>
      <PageHeader
        title="Calculators"
        subtitle={
          <>
            Field, frequency, depth and sensitivity estimates for NV work. <strong>{caution}</strong> Each card states its assumptions and source.
          </>
        }
      />
      <p className="mb-6 rounded-sm border border-rule bg-sheet px-4 py-3 text-sm">
        <span aria-hidden className="mr-2">
          ⚠
        </span>
        These numbers are estimates from textbook formulas, not calibrations of your setup. Lab work with lasers and microwave sources follows your
        institution&apos;s safety rules and licensed practice.
      </p>
      <div className="grid gap-5 md:grid-cols-2">
        {calculators.map((c) => (
          <CalculatorCard key={c.id} calculator={JSON.parse(JSON.stringify(c)) as CalculatorView} />
        ))}
      </div>
    </>
  );
}
