// The part type of something new (a rule, a reference set): the plant's part types as chips, with
// their loading and error states and the field's own error under them.
import { usePartTypes } from '../hooks/useReferenceSets';
import { ChoiceChips } from './ChoiceChips';
import { FieldError } from './FieldError';
import { ErrorState, LoadingState } from './StateViews';

export function PartTypeField({ value, onChange, error }: { value: string | null; onChange: (code: string) => void; error?: string }) {
  const partTypes = usePartTypes();
  return (
    <>
      {partTypes.isError ? (
        <ErrorState error={partTypes.error} onRetry={() => void partTypes.refetch()} />
      ) : !partTypes.data ? (
        <LoadingState label="Loading part types…" />
      ) : (
        <ChoiceChips label="Part type" choices={partTypes.data.map((p) => ({ value: p.code, label: p.name }))} value={value ?? ''} onChange={onChange} />
      )}
      <FieldError error={error} />
    </>
  );
}
