import { useState } from 'react';
import { Link } from 'react-router';
import { FileUp, Plus } from 'lucide-react';
import { Button, buttonClasses } from '../../../components/ui/button';
import type { ImportTarget } from '../api/import-rows';
import { ImportDialog } from './import-dialog';

/** The header actions of a catalogue list: import a spreadsheet (with its dialog), or add one record by hand. */
export function ImportOrAdd({
  target,
  addTo,
  addLabel,
}: {
  target: ImportTarget;
  addTo: string;
  addLabel: string;
}) {
  const [importing, setImporting] = useState(false);
  return (
    <>
      <Button
        variant="secondary"
        icon={<FileUp className="size-4" aria-hidden />}
        onClick={() => setImporting(true)}
      >
        Import CSV
      </Button>
      <Link to={addTo} className={buttonClasses('primary')}>
        <Plus className="size-4" aria-hidden /> {addLabel}
      </Link>
      {/* A closed <dialog> takes no room in the header; an open one shows above the page. */}
      <ImportDialog target={target} open={importing} onClose={() => setImporting(false)} />
    </>
  );
}
