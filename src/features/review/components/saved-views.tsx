import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import type { SavedViewDto, SavedViewFilters } from '../../../../shared/schemas/saved-views';
import { Button } from '../../../components/ui/button';
import { InputField, SelectField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import type { QueueFilters } from '../api/review-queries';
import { createSavedView, deleteSavedView, savedViewQueries } from '../api/saved-views';

/** A reviewer's own saved filter sets, one pick away in the desk's top row. */
export function SavedViewPicker({
  viewId,
  onApply,
  onClear,
}: {
  viewId: string;
  onApply: (view: SavedViewDto) => void;
  onClear: () => void;
}) {
  const { data } = useQuery(savedViewQueries.list());
  const views = data?.items ?? [];
  return (
    <SelectField
      label="Saved view"
      className="min-w-0 basis-40"
      value={viewId}
      onChange={(e) => {
        const v = views.find((x) => x.id === e.target.value);
        if (v) onApply(v);
        else onClear();
      }}
    >
      <option value="">Every open claim</option>
      {views.map((v) => (
        <option key={v.id} value={v.id}>
          {v.name}
        </option>
      ))}
    </SelectField>
  );
}

/** The snapshot kept for a view: the filters and sort as set now, never the page. */
function snapshotOf(f: QueueFilters): SavedViewFilters {
  const entries = Object.entries({ ...f, page: undefined }).filter(([, v]) => v !== undefined && v !== '');
  return Object.fromEntries(entries) as SavedViewFilters;
}

/** Names the filters as set and keeps them; or deletes the view being looked at. */
export function SaveViewForm({
  filters,
  viewId,
  onSaved,
  onDeleted,
}: {
  filters: QueueFilters;
  viewId: string;
  onSaved: (id: string) => void;
  onDeleted: () => void;
}) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const [name, setName] = useState('');
  const { data } = useQuery(savedViewQueries.list());
  const current = data?.items.find((v) => v.id === viewId);
  const save = useMutation({
    mutationFn: () => createSavedView({ name, filters: snapshotOf(filters) }),
    onSuccess: async ({ view }) => {
      notify(`View "${view.name}" saved.`);
      setName('');
      await qc.invalidateQueries({ queryKey: savedViewQueries.all });
      onSaved(view.id);
    },
  });
  const remove = useMutation({
    mutationFn: (id: string) => deleteSavedView(id),
    onSuccess: async () => {
      notify('View deleted.');
      await qc.invalidateQueries({ queryKey: savedViewQueries.all });
      onDeleted();
    },
  });
  const err = save.error instanceof ApiError ? save.error : null;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate();
  };
  return (
    <form className="flex flex-wrap items-end gap-2" onSubmit={submit}>
      <InputField
        className="min-w-0 flex-1 basis-48"
        label="Save these filters as a view"
        placeholder="My open, oldest first"
        value={name}
        maxLength={80}
        error={err ? (err.details[0]?.message ?? err.message) : undefined}
        onChange={(e) => setName(e.target.value)}
      />
      <Button type="submit" variant="secondary" loading={save.isPending} disabled={!name.trim()}>
        Save view
      </Button>
      {current ? (
        <Button variant="ghost" loading={remove.isPending} onClick={() => remove.mutate(current.id)}>
          Delete “{current.name}”
        </Button>
      ) : null}
    </form>
  );
}
