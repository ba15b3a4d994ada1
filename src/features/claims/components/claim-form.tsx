import type { ReactNode } from 'react';
import type { ClaimDetailDto } from '../../../../shared/schemas/claims';
import { useClaimForm } from '../hooks/use-claim-form';
import { AttachmentsPanel } from './attachments-panel';
import { DraftStatus } from './claim-form/draft-status';
import { FilingCard } from './claim-form/filing-card';
import { ObservationsSection } from './claim-form/observations-section';
import { ReadingsSection } from './claim-form/readings-section';
import { Section } from './claim-form/section';
import { UnitsSection } from './claim-form/units-section';
import { SafetyCallout } from './safety-callout';

/**
 * Filing a claim from the field: the form on the left (or above, on a phone), the engine's live evaluation
 * beside it (given by the route as `renderEvaluation`, so features stay apart). Saves the draft as the user
 * types; keeps unsent changes on the device when offline. The state lives in `useClaimForm`; each numbered
 * part of the form is its own component in ./claim-form/.
 */
export type RenderEvaluation = (input: unknown, variant: 'panel' | 'summary') => ReactNode;

export function ClaimForm({
  claim,
  renderEvaluation,
}: {
  claim: ClaimDetailDto;
  renderEvaluation: RenderEvaluation;
}) {
  const f = useClaimForm(claim);
  const inst = claim.installationDetail;
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem] lg:items-start">
      <form
        noValidate
        aria-label="Claim"
        className="min-w-0 space-y-5"
        onSubmit={(e) => {
          e.preventDefault();
          f.submit();
        }}
      >
        <DraftStatus
          status={f.sync.status}
          error={f.sync.error}
          siteName={inst.siteName}
          summary={renderEvaluation(f.liveInput, 'summary')}
          conflict={f.conflict}
          onKeepMine={f.keepMine}
          onUseSaved={f.takeSaved}
        />
        <UnitsSection
          inst={inst}
          selectedSerials={f.values.serials ?? []}
          register={f.register}
          setValue={f.setValue}
          err={f.err}
        />
        <SafetyCallout />
        <ReadingsSection
          product={claim.engineContext.product}
          strings={f.values.measurements?.strings ?? []}
          units={f.units}
          setUnits={f.setUnits}
          register={f.register}
          err={f.err}
        />
        <ObservationsSection register={f.register} err={f.err} />
        <Section n={4} title="Photos and proof of purchase">
          <AttachmentsPanel
            claimId={claim.id}
            attachments={f.attachments}
            editable
            removable
            onChange={f.setAttachments}
          />
        </Section>
        <FilingCard inst={inst} missing={f.missing} file={f.file} />
      </form>
      <aside id="live-evaluation" aria-label="Live evaluation" className="min-w-0 lg:sticky lg:top-4">
        {renderEvaluation(f.liveInput, 'panel')}
      </aside>
    </div>
  );
}
