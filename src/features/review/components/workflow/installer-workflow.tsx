import { useState, type FormEvent } from 'react';
import { STAGE_LABELS } from '../../../../../shared/claims/stages';
import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import { Button } from '../../../../components/ui/button';
import { Card, CardHeader } from '../../../../components/ui/card';
import { InputField } from '../../../../components/ui/field';
import { ApiError } from '../../../../lib/api-client';
import { uploadConversationFile } from '../../api/upload-conversation-file';
import { CalendarDate } from '../../../../components/ui/date-time';
import { DecisionCard } from './decision-card';
import { ErrorText } from './error-text';
import { Returns } from './returns';
import { TextArea } from './text-area';
import { Thread } from './thread';
import { useMove } from './use-move';
import { useToday } from '../../../../lib/dates';

/** The installer's side: what is asked and by when, answering with files, recording the shipment. */
export function InstallerWorkflow({ wf }: { wf: ClaimWorkflowDto }) {
  const today = useToday();
  const move = useMove(wf.claim.id, wf.claim.version);
  const [message, setMessage] = useState('');
  const [files, setFiles] = useState<File[]>([]);
  const [uploading, setUploading] = useState(false);
  const [ship, setShip] = useState({
    carrier: '',
    trackingNumber: '',
    shippedOn: today,
  });
  const [uploadError, setUploadError] = useState<ApiError | null>(null);
  async function answer(e: FormEvent) {
    e.preventDefault();
    setUploading(true);
    setUploadError(null);
    try {
      const ids = [];
      for (const f of files) ids.push((await uploadConversationFile(wf.claim.id, f)).attachment.id);
      move.run('answer_info', { message, ...(ids.length ? { attachmentIds: ids } : {}) });
    } catch (err) {
      // A refused file (not a photo or PDF, too large, …) stops the answer: nothing is sent without it.
      setUploadError(
        err instanceof ApiError ? err : new ApiError(0, 'unknown', 'The file could not be uploaded.'),
      );
    } finally {
      setUploading(false);
    }
  }
  return (
    <div className="space-y-4">
      <Card>
        <CardHeader
          title="Where the claim stands"
          description={`${STAGE_LABELS[wf.claim.stage]}${wf.claim.waitingOn === 'contractor' ? ' — waiting on you' : ''}`}
        />
        <div className="space-y-4 px-4 py-4 sm:px-5">
          <ErrorText error={move.error} />
          <ErrorText error={uploadError} />
          {wf.actions.includes('answer_info') && wf.openRequest ? (
            <form className="space-y-3" onSubmit={answer}>
              <p className="text-sm">
                <strong>The manufacturer asks</strong>
                {wf.openRequest.dueOn ? (
                  <>
                    {' '}
                    (answer by <CalendarDate value={wf.openRequest.dueOn} />)
                  </>
                ) : null}
                :
              </p>
              <blockquote className="rounded-lg bg-ink-50 p-3 text-sm whitespace-pre-wrap">
                {wf.openRequest.body}
              </blockquote>
              <TextArea label="Your answer" value={message} onChange={setMessage} />
              <InputField
                label="Photos or documents"
                type="file"
                multiple
                accept="image/jpeg,image/png,image/webp,application/pdf"
                onChange={(e) => setFiles([...(e.target.files ?? [])])}
              />
              <Button type="submit" loading={move.pending || uploading}>
                Send answer
              </Button>
            </form>
          ) : null}
          {wf.actions.includes('record_shipment') ? (
            <form
              className="grid gap-3 sm:grid-cols-3"
              onSubmit={(e) => {
                e.preventDefault();
                move.run('record_shipment', ship);
              }}
            >
              <InputField
                label="Carrier"
                value={ship.carrier}
                onChange={(e) => setShip({ ...ship, carrier: e.target.value })}
              />
              <InputField
                label="Tracking number"
                value={ship.trackingNumber}
                onChange={(e) => setShip({ ...ship, trackingNumber: e.target.value })}
              />
              <InputField
                label="Shipped on"
                type="date"
                value={ship.shippedOn}
                onChange={(e) => setShip({ ...ship, shippedOn: e.target.value })}
              />
              <Button type="submit" loading={move.pending} className="sm:col-span-3 sm:w-fit">
                Record shipment
              </Button>
            </form>
          ) : null}
        </div>
      </Card>
      <DecisionCard wf={wf} />
      <Returns wf={wf} />
      <Thread wf={wf} />
    </div>
  );
}
