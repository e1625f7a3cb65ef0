import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ColumnMapping, SweepMode, SweepSummary } from '../../../../shared/schemas/sweeps';
import { uploadWithProgress, type UploadProgress } from '../../../lib/upload-with-progress';
import { columnMappingQueryKey } from './get-column-mapping';
import { sessionQueryKey } from './get-session';
import { sessionsQueryKey } from './get-sessions';

export type UploadSweepVariables = {
  sessionId: string;
  file: File;
  mode: SweepMode;
  /** null for a file with the canonical header. */
  mapping: ColumnMapping | null;
  averageRepeats: boolean;
  onProgress: (progress: UploadProgress) => void;
};

/** Upload one sweep table. The text fields go before the file: the server reads the file as it streams. */
export function uploadSweep({ sessionId, file, mode, mapping, averageRepeats, onProgress }: UploadSweepVariables): Promise<{ sweeps: SweepSummary[] }> {
  const form = new FormData();
  form.append('mode', mode);
  if (mapping) {
    form.append('mapping', JSON.stringify(mapping));
    form.append('rememberMapping', 'true');
  }
  form.append('averageRepeats', String(averageRepeats));
  form.append('file', file, file.name);
  return uploadWithProgress(`/api/sessions/${encodeURIComponent(sessionId)}/sweeps`, form, onProgress);
}

export function useUploadSweep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadSweep,
    onSuccess: (_result, { sessionId, mapping }) => {
      void queryClient.invalidateQueries({ queryKey: sessionQueryKey(sessionId) });
      void queryClient.invalidateQueries({ queryKey: [...sessionsQueryKey, 'list'] });
      if (mapping) void queryClient.invalidateQueries({ queryKey: columnMappingQueryKey });
    },
  });
}
