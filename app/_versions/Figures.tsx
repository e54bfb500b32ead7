'use client';
// Every evidence plot of a version, drawn in the shared plot frame; each is saved as SVG with its
// own button (the trajectory plots of the text are saved from their blocks).
import { PlotFrame, evidencePlot } from '@/components/plot';
import type { VersionClaim } from '@/server/versions/types';

export function Figures({ claims }: { claims: VersionClaim[] }) {
  const plots = claims.flatMap((claim) => (claim.result.evidence.plots ?? []).map((plot, i) => ({ claim, plot, key: `${claim.stepId}-${i}` })));
  return (
    <section id="figures" aria-label="Figures" className="mt-8">
      <h2 className="mb-2 border-b border-rule pb-1 text-xl">Figures</h2>
      {plots.length === 0 ? (
        <p className="text-ink-soft">The checks of this version drew no convergence plots; trajectory plots are in the text above, each with “Save as SVG”.</p>
      ) : (
        <div className="space-y-4">
          {plots.map(({ claim, plot, key }) => (
            <PlotFrame key={key} {...evidencePlot(plot, key)} title={`${claim.claimId}: ${plot.title}`} height={280} />
          ))}
        </div>
      )}
    </section>
  );
}
